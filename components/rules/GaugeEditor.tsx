// Gauges: what each measures, where (a region in fractions of the image), in which unit, and its limits.
import { StyleSheet, View } from 'react-native';
import { GAUGE_MEASURES, UNITS_OF_MEASURE, type Region } from '../../shared/rules/schema';
import { limitProblems, screenLimitMessage, type LimitBound } from '../../shared/rules/limits';
import { describeLimits, unitSymbol } from '../../shared/rules/units';
import { MEASURE_LABELS } from '../../shared/rules/words';
import type { FieldIssue } from '../../shared/api/errors';
import { colors, radius, space } from '../../lib/theme';
import { AppText } from '../AppText';
import { Button } from '../Button';
import { Card } from '../Card';
import { ChoiceChips } from '../ChoiceChips';
import { TextField } from '../TextField';
import { NumberField } from './NumberField';
import type { EditorAction, EditorGauge, EditorStep } from './ruleEditorState';
import { MASK_MEASURES, outputsMask, STEP_DESCRIPTIONS, stepNames } from './stepCatalogue';
import { EditToggle, OpenAllButton } from './CardToggles';
import { fieldMessage } from './fieldMessage';
import { useOpenCards } from './useOpenCards';


const FRACTION = { min: 0, max: 1, unit: 'fraction', step: 0.01 };
const ANY = { min: -1e9, max: 1e9, step: 1 };

interface GaugeEditorProps {
  gauges: EditorGauge[];
  steps: EditorStep[];
  issues: Map<string, FieldIssue[]>;
  drawingKey: string | null;
  onDraw: (key: string | null) => void;
  dispatch: (action: EditorAction) => void;
}

const REGION_WORDS: Record<Region['shape'] | 'whole', string> = { whole: 'whole photo', rect: 'rectangle', circle: 'circle' };

/** "Largest blob area on Step 4: Threshold · 1716.8 to 1730 mm² · whole photo": a closed gauge's line. */
function gaugeSummary(gauge: EditorGauge['gauge'], measuredName: string): string {
  const { min, max } = gauge.limits;
  const limits = min === undefined && max === undefined ? 'no limits yet' : describeLimits(min, max, gauge.unit);
  return `${MEASURE_LABELS[gauge.measure]} on ${measuredName} · ${limits} · ${REGION_WORDS[gauge.region?.shape ?? 'whole']}`;
}

function defaultRegion(shape: Region['shape']): Region {
  return shape === 'rect' ? { shape, x: 0.25, y: 0.25, w: 0.5, h: 0.5 } : { shape, cx: 0.5, cy: 0.5, r: 0.3 };
}

export function GaugeEditor({ gauges, steps, issues, drawingKey, onDraw, dispatch }: GaugeEditorProps) {
  const enabled = steps.filter((s) => s.enabled);
  const names = stepNames(enabled.map((s) => s.step));
  // What a gauge measures when no earlier step is chosen: the last step's output, or the photo.
  const lastStep = enabled.length > 0 ? `last step (${names[names.length - 1]})` : null;
  const cards = useOpenCards(gauges.map((g) => g.key));
  const isOpen = (entry: EditorGauge) => cards.isOpen(entry.key, (issues.get(entry.key) ?? []).length > 0 || drawingKey === entry.key);
  const addGauge = () => {
    let n = gauges.length + 1;
    while (gauges.some((g) => g.gauge.name === `Gauge ${n}`)) n += 1;
    dispatch({ type: 'add-gauge', gauge: { name: `Gauge ${n}`, measure: 'largest-blob-area', unit: 'px2', limits: { max: 100 } } });
  };
  return (
    <View style={styles.list}>
      <OpenAllButton noun="gauge" count={gauges.length} allOpen={gauges.every(isOpen)} onPress={(open) => cards.setAll(gauges.map((g) => g.key), open)} />
      {gauges.length === 0 ? <AppText tone="muted">No gauges yet: without one, every usable photo passes. Add a gauge with a limit.</AppText> : null}
      {gauges.map((entry, index) => {
        const { gauge } = entry;
        const gaugeIssues = issues.get(entry.key) ?? [];
        const errorOf = (field: string) => gaugeIssues.find((i) => i.path === field || i.path.startsWith(`${field}.`))?.message;
        const change = (next: Partial<EditorGauge['gauge']>, stepKey = entry.stepKey) => dispatch({ type: 'change-gauge', key: entry.key, gauge: { ...gauge, ...next }, stepKey });
        const units = UNITS_OF_MEASURE[gauge.measure];
        // The schema's limit checks (shared/rules/limits.ts) in the fields' own words; "none set" shows on Lowest.
        const problems = limitProblems(gauge.measure, gauge.limits);
        const limitError = (bound: LimitBound) => {
          const own = problems.find((p) => p.bound === bound || (p.bound === null && bound === 'min'));
          return own ? screenLimitMessage(own, MEASURE_LABELS[gauge.measure]) : errorOf(`limits.${bound}`);
        };
        // The steps up to the measured one (all of them for "the last step", or a step no longer enabled).
        const chosen = entry.stepKey ? enabled.findIndex((s) => s.key === entry.stepKey) : -1;
        const measuredSteps = chosen >= 0 ? enabled.slice(0, chosen + 1) : enabled;
        const notAMask = (MASK_MEASURES as readonly string[]).includes(gauge.measure) && !outputsMask(measuredSteps.map((s) => s.step));
        const region = gauge.region;
        const label = `Gauge ${index + 1}, ${gauge.name}`;
        const setRegion = (patch: Record<string, number | undefined>) => {
          if (!region) return;
          const next = { ...region } as Record<string, unknown>;
          for (const [k, v] of Object.entries(patch)) if (v !== undefined) next[k] = v;
          change({ region: next as Region });
        };
        const open = isOpen(entry);
        const held = open && (gaugeIssues.length > 0 || drawingKey === entry.key);
        const measuredName = chosen >= 0 && chosen < enabled.length - 1 ? names[chosen] : lastStep ? `the ${lastStep}` : 'the photo';
        return (
          <Card key={entry.key} style={styles.gauge} accessibilityLabel={label}>
            <View style={styles.header}>
              <View style={styles.grow}>
                <AppText variant="bodyStrong">{label}</AppText>
                <AppText variant="caption" tone="muted">{gaugeSummary(gauge, measuredName)}</AppText>
              </View>
              <EditToggle name={label} open={open} held={held} onPress={(next) => cards.setOpen(entry.key, next)} />
              {open ? <Button label="Remove" compact variant="quiet" accessibilityLabel={`Remove ${label}`} onPress={() => dispatch({ type: 'remove-gauge', key: entry.key })} /> : null}
            </View>
            {open ? (
              <>
                <TextField label="Gauge name" accessibilityLabel={`Gauge ${index + 1} name`} value={gauge.name} onChangeText={(name) => change({ name })} error={fieldMessage(errorOf('name'), 'Gauge name')} />
                <ChoiceChips
                  label="Measure"
                  choices={GAUGE_MEASURES.map((m) => ({ value: m, label: MEASURE_LABELS[m] }))}
                  value={gauge.measure}
                  onChange={(measure) => {
                    const allowed = UNITS_OF_MEASURE[measure];
                    const unit = gauge.unit && allowed.includes(gauge.unit) ? gauge.unit : allowed[0];
                    const { unit: _old, ...rest } = gauge;
                    dispatch({ type: 'change-gauge', key: entry.key, gauge: unit ? { ...rest, measure, unit } : { ...rest, measure }, stepKey: entry.stepKey });
                  }}
                />
                <ChoiceChips
                  label="Measured on"
                  choices={[
                    { value: '', label: lastStep ? `The ${lastStep}` : 'The photo (no steps)' },
                    ...enabled.slice(0, -1).map((s, i) => ({ value: s.key, label: names[i] })),
                  ]}
                  value={entry.stepKey && enabled.some((s) => s.key === entry.stepKey) ? entry.stepKey : ''}
                  onChange={(key) => change({}, key === '' ? null : key)}
                />
                {notAMask ? (
                  <View style={styles.note} accessibilityRole="text">
                    <AppText variant="caption" tone="caution">
                      {`ℹ ${measuredSteps.length === 0 ? 'The photo' : `Step ${measuredSteps.length} (${STEP_DESCRIPTIONS[measuredSteps[measuredSteps.length - 1].step.op].title})`} is not a mask, so this measure counts every pixel that is not exactly 0. Add a threshold step and measure its mask.`}
                    </AppText>
                  </View>
                ) : null}
                {units.length > 0 ? (
                  <ChoiceChips label="Unit" choices={units.map((u) => ({ value: u, label: unitSymbol(u) }))} value={gauge.unit ?? units[0]} onChange={(unit) => change({ unit })} />
                ) : (
                  <AppText variant="caption" tone="muted">This measure has no unit.</AppText>
                )}
                {errorOf('unit') ? <AppText tone="danger" variant="caption">{`⚠ ${errorOf('unit')}`}</AppText> : null}
                <View style={styles.row}>
                  <View style={styles.half}>
                    <NumberField spec={{ ...ANY, label: 'Lowest allowed', unit: unitSymbol(gauge.unit) }} accessibilityLabel={`Gauge ${index + 1}, lowest allowed${gauge.unit ? ` (${unitSymbol(gauge.unit)})` : ''}`} optional value={gauge.limits.min} onChange={(min) => change({ limits: { ...gauge.limits, min } })} error={limitError('min')} />
                  </View>
                  <View style={styles.half}>
                    <NumberField spec={{ ...ANY, label: 'Highest allowed', unit: unitSymbol(gauge.unit) }} accessibilityLabel={`Gauge ${index + 1}, highest allowed${gauge.unit ? ` (${unitSymbol(gauge.unit)})` : ''}`} optional value={gauge.limits.max} onChange={(max) => change({ limits: { ...gauge.limits, max } })} error={limitError('max')} />
                  </View>
                </View>
                <ChoiceChips
                  label="Region"
                  choices={[
                    { value: 'whole', label: 'Whole photo' },
                    { value: 'rect', label: 'Rectangle' },
                    { value: 'circle', label: 'Circle' },
                  ]}
                  value={region?.shape ?? 'whole'}
                  onChange={(shape) => {
                    if (shape === 'whole') {
                      const { region: _gone, ...rest } = gauge;
                      dispatch({ type: 'change-gauge', key: entry.key, gauge: rest, stepKey: entry.stepKey });
                    } else change({ region: defaultRegion(shape) });
                  }}
                />
                {region ? (
                  <View style={styles.regionBox}>
                    <AppText variant="caption" tone="muted">Fractions of the photo’s width and height, from the top left corner (0 to 1).</AppText>
                    <View style={styles.row}>
                      {region.shape === 'rect' ? (
                        <>
                          <View style={styles.quarter}><NumberField spec={{ ...FRACTION, label: 'Left (x)' }} value={region.x} onChange={(x) => setRegion({ x })} error={errorOf('region.x')} /></View>
                          <View style={styles.quarter}><NumberField spec={{ ...FRACTION, label: 'Top (y)' }} value={region.y} onChange={(y) => setRegion({ y })} error={errorOf('region.y')} /></View>
                          <View style={styles.quarter}><NumberField spec={{ ...FRACTION, label: 'Width (w)' }} value={region.w} onChange={(w) => setRegion({ w })} error={errorOf('region.w')} /></View>
                          <View style={styles.quarter}><NumberField spec={{ ...FRACTION, label: 'Height (h)' }} value={region.h} onChange={(h) => setRegion({ h })} error={errorOf('region.h')} /></View>
                        </>
                      ) : (
                        <>
                          <View style={styles.quarter}><NumberField spec={{ ...FRACTION, label: 'Centre across (cx)' }} value={region.cx} onChange={(cx) => setRegion({ cx })} error={errorOf('region.cx')} /></View>
                          <View style={styles.quarter}><NumberField spec={{ ...FRACTION, label: 'Centre down (cy)' }} value={region.cy} onChange={(cy) => setRegion({ cy })} error={errorOf('region.cy')} /></View>
                          <View style={styles.quarter}><NumberField spec={{ ...FRACTION, label: 'Radius (r)' }} value={region.r} onChange={(r) => setRegion({ r })} error={errorOf('region.r')} /></View>
                        </>
                      )}
                    </View>
                    <Button
                      label={drawingKey === entry.key ? 'Stop drawing' : 'Draw on the preview'}
                      variant="secondary"
                      compact
                      style={styles.start}
                      accessibilityLabel={drawingKey === entry.key ? `Stop drawing the region of ${gauge.name}` : `Draw the region of ${gauge.name} on the preview`}
                      onPress={() => onDraw(drawingKey === entry.key ? null : entry.key)}
                    />
                  </View>
                ) : null}
              </>
            ) : null}
          </Card>
        );
      })}
      <Button label="Add a gauge" variant="secondary" style={styles.start} onPress={addGauge} />
    </View>
  );
}

const styles = StyleSheet.create({
  list: { gap: space.md },
  gauge: { gap: space.md },
  header: { flexDirection: 'row', alignItems: 'center', gap: space.sm },
  grow: { flex: 1 },
  row: { flexDirection: 'row', flexWrap: 'wrap', gap: space.md },
  half: { flexGrow: 1, flexBasis: 160 },
  quarter: { flexGrow: 1, flexBasis: 130 },
  regionBox: { gap: space.sm, padding: space.md, borderRadius: radius.md, backgroundColor: colors.surfaceSunken },
  start: { alignSelf: 'flex-start' },
  note: { padding: space.sm, borderLeftWidth: 4, borderLeftColor: colors.caution, backgroundColor: colors.cautionTint, borderRadius: radius.sm },
});
