import { useEffect, useState } from 'react';
import { useCreateAlertLimit } from '../../hooks/useAlerts';
import { ApiError } from '../../lib/api';
import { createAlertLimitSchema } from '../../shared/api/alerts';
import type { TrendChoices } from '../../shared/api/trends';
import { AppText } from '../AppText';
import { ChoiceChips } from '../ChoiceChips';
import { Dialog, DialogActions } from '../Dialog';
import { ErrorBanner } from '../ErrorBanner';
import { TextField } from '../TextField';
import { StationChoice } from './StationChoice';

interface AddLimitDialogProps {
  visible: boolean;
  choices: TrendChoices;
  onClose: () => void;
}

/** A new defect-fraction limit: which rule, at which station (or all), and the share failed per day that raises an alert. */
export function AddLimitDialog({ visible, choices, onClose }: AddLimitDialogProps) {
  const create = useCreateAlertLimit();
  const [ruleId, setRuleId] = useState<string | null>(null);
  const [stationId, setStationId] = useState<string | null>(null);
  const [percentText, setPercentText] = useState('');
  const [problems, setProblems] = useState<Record<string, string>>({});
  useEffect(() => {
    if (!visible) {
      setRuleId(null);
      setStationId(null);
      setPercentText('');
      setProblems({});
      create.reset();
    }
  }, [visible]); // eslint-disable-line react-hooks/exhaustive-deps -- only when the dialog opens or closes

  const serverIssues = create.error instanceof ApiError ? Object.fromEntries(create.error.fieldIssues.map((i) => [i.path, i.message])) : {};

  const submit = () => {
    const typed = percentText.replace(',', '.').replace('%', '').trim();
    const percentValue = typed === '' ? NaN : Number(typed);
    const parsed = createAlertLimitSchema.safeParse({ ruleId: ruleId ?? undefined, stationId, maxDefectFraction: percentValue / 100 });
    if (!parsed.success) {
      const found: Record<string, string> = {};
      for (const issue of parsed.error.issues) found[String(issue.path[0])] ??= issue.message;
      if (found.ruleId) found.ruleId = 'Choose the rule the limit watches.';
      // The schema speaks of fractions; the person typed a percentage.
      if (found.maxDefectFraction) found.maxDefectFraction = Number.isNaN(percentValue) ? 'Type a percentage, e.g. 8 for 8 %.' : 'Type a percentage above 0 and at most 100.';
      setProblems(found);
      return;
    }
    setProblems({});
    create.mutate(parsed.data, { onSuccess: onClose });
  };

  const fractionProblem = problems.maxDefectFraction ?? serverIssues.maxDefectFraction;
  return (
    <Dialog
      visible={visible}
      title="Add an alert limit"
      onClose={onClose}
      actions={<DialogActions label="Add limit" onConfirm={submit} onCancel={onClose} busy={create.isPending} />}
    >
      <AppText>An alert is raised when a day’s share of failed parts for the rule passes the limit. Set it from the process’s usual rate and the plant’s quality procedures.</AppText>
      <ChoiceChips<string | null> label="Rule" value={ruleId} onChange={setRuleId} choices={choices.rules.map((r) => ({ value: r.id, label: r.name }))} />
      {problems.ruleId || serverIssues.ruleId ? (
        <AppText variant="caption" tone="danger" accessibilityRole="alert">{`⚠ ${problems.ruleId ?? serverIssues.ruleId}`}</AppText>
      ) : null}
      <StationChoice lines={choices.lines} value={stationId} onChange={setStationId} anyLabel="Every station" />
      <TextField
        label="Alert above this share failed per day (%)"
        value={percentText}
        onChangeText={(text) => {
          setPercentText(text);
          setProblems((p) => ({ ...p, maxDefectFraction: '' }));
        }}
        keyboardType="decimal-pad"
        placeholder="8"
        error={fractionProblem ? fractionProblem : undefined}
      />
      {create.isError && Object.keys(serverIssues).length === 0 ? <ErrorBanner error={create.error} /> : null}
    </Dialog>
  );
}
