// The photo quality gate: a photo below these is a RETAKE, never judged.
import { StyleSheet, View } from 'react-native';
import type { QualityLimits } from '../../shared/rules/schema';
import type { FieldIssue } from '../../shared/api/errors';
import { space } from '../../lib/theme';
import { NumberField } from './NumberField';

interface QualityGateEditorProps {
  quality: QualityLimits | undefined;
  issues: FieldIssue[];
  onChange: (quality: QualityLimits | undefined) => void;
}

export function QualityGateEditor({ quality, issues, onChange }: QualityGateEditorProps) {
  const errorOf = (field: string) => issues.find((i) => i.path === `quality.${field}`)?.message;
  const set = (field: keyof QualityLimits) => (value: number | undefined) => {
    const next: QualityLimits = { ...quality };
    if (value === undefined) delete next[field];
    else next[field] = value;
    onChange(Object.keys(next).length > 0 ? next : undefined);
  };
  return (
    <View style={styles.row}>
      <View style={styles.cell}>
        <NumberField optional label="Lowest focus" spec={{ label: 'Lowest focus', min: 0, max: 1e9, unit: 'Laplacian variance', step: 1 }} value={quality?.minFocus} onChange={set('minFocus')} error={errorOf('minFocus')} />
      </View>
      <View style={styles.cell}>
        <NumberField optional label="Largest clipped share" spec={{ label: 'Largest clipped share', min: 0, max: 1, unit: 'fraction', step: 0.01 }} value={quality?.maxClipped} onChange={set('maxClipped')} error={errorOf('maxClipped')} />
      </View>
      <View style={styles.cell}>
        <NumberField optional label="Lowest mean brightness" spec={{ label: 'Lowest mean brightness', min: 0, max: 1e9, unit: 'grey level', step: 1 }} value={quality?.minMean} onChange={set('minMean')} error={errorOf('minMean')} />
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  row: { flexDirection: 'row', flexWrap: 'wrap', gap: space.md },
  cell: { flexGrow: 1, flexBasis: 180 },
});
