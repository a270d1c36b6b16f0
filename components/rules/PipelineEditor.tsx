// The pipeline: steps in order, each with its parameters; add, reorder, duplicate, remove and disable.
// A saved step shows its one-line summary until it is opened for editing, so that a long pipeline
// reads as a list on a phone; a step added here, or one with a problem, opens by itself.
import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { STEP_OPS } from '../../shared/rules/schema';
import type { FieldIssue } from '../../shared/api/errors';
import type { KernelInfo } from '../../shared/api/kernels';
import { colors, radius, space } from '../../lib/theme';
import { AppText } from '../AppText';
import { Button } from '../Button';
import { Card } from '../Card';
import { ChoiceChips } from '../ChoiceChips';
import type { EditorAction, EditorStep } from './ruleEditorState';
import { describeStep, STEP_DESCRIPTIONS, type StepOp } from './stepCatalogue';
import { StepParameters } from './StepParameters';
import { EditToggle, OpenAllButton } from './CardToggles';
import { useOpenCards } from './useOpenCards';

interface PipelineEditorProps {
  steps: EditorStep[];
  kernels: readonly KernelInfo[];
  canSaveKernel: boolean;
  issues: Map<string, FieldIssue[]>;
  dispatch: (action: EditorAction) => void;
}

export function PipelineEditor({ steps, kernels, canSaveKernel, issues, dispatch }: PipelineEditorProps) {
  const [adding, setAdding] = useState<StepOp>('gaussian');
  const cards = useOpenCards(steps.map((s) => s.key));
  const hasIssues = (key: string) => (issues.get(key) ?? []).length > 0;
  const isOpen = (entry: EditorStep) => entry.enabled && cards.isOpen(entry.key, hasIssues(entry.key));
  const openable = steps.filter((s) => s.enabled);
  let enabledNumber = 0;
  return (
    <View style={styles.list}>
      <OpenAllButton noun="step" count={openable.length} allOpen={openable.every(isOpen)} onPress={(open) => cards.setAll(openable.map((s) => s.key), open)} />
      {steps.length === 0 ? <AppText tone="muted">No steps yet: the gauges would measure the photo itself. Add a step below.</AppText> : null}
      {steps.map((entry, index) => {
        if (entry.enabled) enabledNumber += 1;
        const number = entry.enabled ? enabledNumber : null;
        const description = STEP_DESCRIPTIONS[entry.step.op];
        const stepIssues = issues.get(entry.key) ?? [];
        const errorOf = (field: string) => stepIssues.find((i) => i.path === field || i.path.startsWith(`${field}[`) || i.path.startsWith(`${field}.`))?.message;
        const unplaced = stepIssues.filter((i) => !['sigma', 'size', 'value', 'c', 'radius', 'divisor', 'offset', 'matrix'].some((f) => i.path === f || i.path.startsWith(`${f}[`)));
        const name = `${number ? `Step ${number}` : 'Disabled step'}: ${description.title}`;
        const open = isOpen(entry);
        const held = open && hasIssues(entry.key);
        return (
          <Card key={entry.key} style={[styles.step, !entry.enabled && styles.disabled]} accessibilityLabel={name}>
            <View style={styles.header}>
              <View style={styles.titles}>
                <AppText variant="bodyStrong">{name}</AppText>
                <AppText variant="caption" tone="muted">
                  {entry.enabled ? describeStep(entry.step) : `${describeStep(entry.step)} · left out of the saved rule and the preview`}
                </AppText>
              </View>
              <View style={styles.tools}>
                {entry.enabled ? <EditToggle name={name} open={open} held={held} onPress={(next) => cards.setOpen(entry.key, next)} /> : null}
                <Button label="↑" compact variant="quiet" accessibilityLabel={`Move ${name} up`} disabled={index === 0} onPress={() => dispatch({ type: 'move-step', key: entry.key, by: -1 })} />
                <Button label="↓" compact variant="quiet" accessibilityLabel={`Move ${name} down`} disabled={index === steps.length - 1} onPress={() => dispatch({ type: 'move-step', key: entry.key, by: 1 })} />
                {/* A closed step offers what a list needs (open, reorder); the rest waits behind Edit. */}
                {open || !entry.enabled ? (
                  <>
                    <Button label="Duplicate" compact variant="quiet" accessibilityLabel={`Duplicate ${name}`} onPress={() => dispatch({ type: 'duplicate-step', key: entry.key })} />
                    <Button label={entry.enabled ? 'Disable' : 'Enable'} compact variant="quiet" accessibilityLabel={`${entry.enabled ? 'Disable' : 'Enable'} ${name}`} onPress={() => dispatch({ type: 'toggle-step', key: entry.key })} />
                    <Button label="Remove" compact variant="quiet" accessibilityLabel={`Remove ${name}`} onPress={() => dispatch({ type: 'remove-step', key: entry.key })} />
                  </>
                ) : null}
              </View>
            </View>
            {open ? (
              <StepParameters stepName={name} step={entry.step} kernels={kernels} canSaveKernel={canSaveKernel} errorOf={errorOf} onChange={(step) => dispatch({ type: 'change-step', key: entry.key, step })} />
            ) : null}
            {unplaced.map((issue) => (
              <AppText key={`${issue.path}-${issue.message}`} tone="danger" variant="caption" accessibilityRole="alert">{`⚠ ${issue.path}: ${issue.message}`}</AppText>
            ))}
          </Card>
        );
      })}
      <View style={styles.adder}>
        <ChoiceChips label="Add a step" choices={STEP_OPS.map((op) => ({ value: op, label: STEP_DESCRIPTIONS[op].title }))} value={adding} onChange={setAdding} />
        <AppText variant="caption" tone="muted">{STEP_DESCRIPTIONS[adding].purpose}</AppText>
        <Button
          label={`Add ${STEP_DESCRIPTIONS[adding].title}`}
          variant="secondary"
          style={styles.start}
          onPress={() => dispatch({ type: 'add-step', step: structuredClone(STEP_DESCRIPTIONS[adding].starting) })}
        />
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  list: { gap: space.md },
  step: { gap: space.md },
  disabled: { backgroundColor: colors.surfaceMuted, borderStyle: 'dashed', borderColor: colors.control },
  header: { flexDirection: 'row', flexWrap: 'wrap', justifyContent: 'space-between', gap: space.sm },
  titles: { flexGrow: 1, flexShrink: 1, flexBasis: 200, gap: space.xxs },
  tools: { flexDirection: 'row', flexWrap: 'wrap', gap: space.xxs, flexShrink: 1, maxWidth: '100%' },
  adder: { gap: space.sm, padding: space.md, borderRadius: radius.lg, backgroundColor: colors.surfaceSunken },
  start: { alignSelf: 'flex-start' },
});
