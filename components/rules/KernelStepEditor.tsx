// A kernel step: a kernel from the library, or a matrix edited in a grid with divisor and offset.
import { useState } from 'react';
import { ScrollView, StyleSheet, TextInput, View } from 'react-native';
import type { KernelStep } from '../../shared/rules/schema';
import type { KernelInfo } from '../../shared/api/kernels';
import { colors, minTouchTarget, radius, space, type as typeScale } from '../../lib/theme';
import { AppText } from '../AppText';
import { Button } from '../Button';
import { ChoiceChips } from '../ChoiceChips';
import { NumberField } from './NumberField';
import { SaveKernelDialog } from './SaveKernelDialog';

interface KernelStepEditorProps {
  step: KernelStep;
  kernels: readonly KernelInfo[];
  canSaveKernel: boolean;
  onChange: (step: KernelStep) => void;
  errorOf: (field: string) => string | undefined;
  /** The step's name ("Step 2: Kernel"), said before each field's label. */
  stepName: string;
}

const SIZES = [1, 3, 5, 7, 9] as const;

/** The sizes offered, with the matrix's own when it is larger (a rule document may hold up to 31). */
/** `noun`: "rows" or "columns", for the spoken name ("3 rows"): both groups offer the same numbers. */
function sizeChoices(current: number, noun: string): { value: string; label: string; accessibilityLabel: string }[] {
  const sizes: number[] = SIZES.includes(current as (typeof SIZES)[number]) ? [...SIZES] : [...SIZES, current].sort((a, b) => a - b);
  return sizes.map((n) => ({ value: String(n), label: String(n), accessibilityLabel: `${n} ${noun}` }));
}
const ANY = { min: -1e9, max: 1e9, step: 1 };

function resized(matrix: number[][], rows: number, cols: number): number[][] {
  const oldRows = matrix.length;
  const oldCols = matrix[0]?.length ?? 0;
  // Keep the old weights centred in the new grid.
  const dy = Math.floor((rows - oldRows) / 2);
  const dx = Math.floor((cols - oldCols) / 2);
  return Array.from({ length: rows }, (_, j) => Array.from({ length: cols }, (_, i) => matrix[j - dy]?.[i - dx] ?? 0));
}

export function weightSum(matrix: readonly (readonly number[])[]): number {
  return matrix.reduce((sum, row) => sum + row.reduce((a, b) => a + b, 0), 0);
}

function MatrixCell({ value, onChange, label }: { value: number; onChange: (v: number) => void; label: string }) {
  const [text, setText] = useState(String(value));
  return (
    <TextInput
      accessibilityLabel={label}
      value={Number(text) === value ? text : String(value)}
      onChangeText={(next) => {
        setText(next);
        const parsed = Number(next.replace(',', '.'));
        if (next.trim() !== '' && Number.isFinite(parsed)) onChange(parsed);
      }}
      inputMode="decimal"
      style={styles.cell}
    />
  );
}

export function KernelStepEditor({ step, kernels, canSaveKernel, onChange, errorOf, stepName }: KernelStepEditorProps) {
  const [saving, setSaving] = useState(false);
  const source = step.kernel !== undefined ? 'library' : 'matrix';
  const matrix = step.matrix ?? [[1]];
  const rows = matrix.length;
  const cols = matrix[0]?.length ?? 1;
  const divisor = step.divisor ?? 1;
  const sum = weightSum(matrix);

  const useLibrary = () => onChange({ op: 'kernel', kernel: kernels[0]?.name ?? 'sharpen' });
  const useMatrix = () => {
    const chosen = kernels.find((k) => k.name === step.kernel);
    onChange({ op: 'kernel', matrix: chosen ? chosen.matrix.map((r) => [...r]) : [[0, 0, 0], [0, 1, 0], [0, 0, 0]], divisor: chosen?.divisor ?? 1, offset: chosen?.offset ?? 0 });
  };
  const setCell = (j: number, i: number, v: number) => onChange({ ...step, matrix: matrix.map((row, y) => row.map((w, x) => (y === j && x === i ? v : w))) });

  return (
    <View style={styles.group}>
      <ChoiceChips
        context={stepName}
        label="Weights from"
        choices={[
          { value: 'library', label: 'Kernel library' },
          { value: 'matrix', label: 'My own matrix' },
        ]}
        value={source}
        onChange={(v) => (v === 'library' ? useLibrary() : useMatrix())}
      />
      {source === 'library' ? (
        <View style={styles.group}>
          <ChoiceChips context={stepName} label="Kernel" choices={kernels.map((k) => ({ value: k.name, label: k.name }))} value={step.kernel ?? ''} onChange={(name) => onChange({ op: 'kernel', kernel: name })} />
          {(() => {
            const chosen = kernels.find((k) => k.name === step.kernel);
            return chosen ? (
              <AppText variant="caption" tone="muted">{`${chosen.description} Source: ${chosen.source}`}</AppText>
            ) : (
              <AppText variant="caption" tone="danger">{`⚠ No kernel named “${step.kernel}” in the library; choose one.`}</AppText>
            );
          })()}
        </View>
      ) : (
        <View style={styles.group}>
          <View style={styles.sizeRow}>
            <ChoiceChips context={stepName} label="Rows" choices={sizeChoices(rows, 'rows')} value={String(rows)} onChange={(v) => onChange({ ...step, matrix: resized(matrix, Number(v), cols) })} />
            <ChoiceChips context={stepName} label="Columns" choices={sizeChoices(cols, 'columns')} value={String(cols)} onChange={(v) => onChange({ ...step, matrix: resized(matrix, rows, Number(v)) })} />
          </View>
          {cols > 5 ? (
            <AppText variant="caption" tone="muted">{`${cols} columns: the grid scrolls sideways.`}</AppText>
          ) : null}
          {/* A wide matrix scrolls sideways in its own box instead of pushing the page past the screen. */}
          <ScrollView horizontal style={styles.gridScroller} contentContainerStyle={styles.gridContent}>
            <View accessibilityLabel={`${stepName}, weights, ${rows} rows by ${cols} columns`} style={styles.grid}>
              {matrix.map((row, j) => (
                <View key={j} style={styles.gridRow}>
                  {row.map((w, i) => (
                    <MatrixCell key={`${j}-${i}-${rows}-${cols}`} value={w} label={`${stepName}, weight row ${j + 1} column ${i + 1}`} onChange={(v) => setCell(j, i, v)} />
                  ))}
                </View>
              ))}
            </View>
          </ScrollView>
          {errorOf('matrix') ? <AppText tone="danger" variant="caption">{`⚠ ${errorOf('matrix')}`}</AppText> : null}
          <View style={styles.sizeRow}>
            <View style={styles.half}>
              <NumberField context={stepName} spec={{ ...ANY, label: 'Divisor', unit: '' }} value={divisor} onChange={(v) => v !== undefined && onChange({ ...step, divisor: v })} error={errorOf('divisor')} />
            </View>
            <View style={styles.half}>
              <NumberField context={stepName} spec={{ ...ANY, label: 'Offset', unit: 'grey level' }} value={step.offset ?? 0} onChange={(v) => v !== undefined && onChange({ ...step, offset: v })} error={errorOf('offset')} />
            </View>
          </View>
          {sum !== divisor ? (
            <View style={styles.note} accessibilityRole="text">
              <AppText variant="caption" tone="caution">
                {sum === 0
                  ? `ℹ The weights sum to 0: the kernel responds to change (edges), not to brightness; flat areas come out as ${step.offset ?? 0}.`
                  : `ℹ The weights sum to ${sum}, not to the divisor ${divisor}: the output is ${+(sum / divisor).toFixed(4)} times as bright as the input. Set the divisor to ${sum} to keep brightness.`}
              </AppText>
            </View>
          ) : null}
          {canSaveKernel ? <Button label="Save as my kernel" variant="secondary" compact onPress={() => setSaving(true)} style={styles.start} /> : null}
          {saving ? (
            <SaveKernelDialog
              matrix={matrix}
              divisor={divisor}
              offset={step.offset ?? 0}
              onClose={() => setSaving(false)}
              onSaved={(name) => {
                setSaving(false);
                onChange({ op: 'kernel', kernel: name });
              }}
            />
          ) : null}
        </View>
      )}
    </View>
  );
}

const styles = StyleSheet.create({
  group: { gap: space.sm },
  sizeRow: { flexDirection: 'row', flexWrap: 'wrap', gap: space.lg },
  half: { flexGrow: 1, flexBasis: 160 },
  gridScroller: { flexGrow: 0, maxWidth: '100%' },
  gridContent: { paddingBottom: space.xs },
  grid: { gap: space.xs, alignSelf: 'flex-start' },
  gridRow: { flexDirection: 'row', gap: space.xs },
  cell: {
    ...typeScale.body,
    width: 56,
    minHeight: minTouchTarget,
    textAlign: 'center',
    borderWidth: 1,
    borderColor: colors.control,
    borderRadius: radius.sm,
    backgroundColor: colors.surface,
    color: colors.ink,
  },
  note: { padding: space.sm, borderLeftWidth: 4, borderLeftColor: colors.caution, backgroundColor: colors.cautionTint, borderRadius: radius.sm },
  start: { alignSelf: 'flex-start' },
});
