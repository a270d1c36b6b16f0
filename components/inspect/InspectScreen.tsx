import { useCallback, useState } from 'react';
import { StyleSheet, useWindowDimensions, View } from 'react-native';
import { useInspectPhoto, useQueuedPhotos, useReleasedRules } from '../../hooks/useInspections';
import { useLayout } from '../../hooks/useLayout';
import { usePartTypes } from '../../hooks/useReferenceSets';
import { useLines } from '../../hooks/useStations';
import { newIdempotencyKey } from '../../lib/idempotencyKey';
import { readInspectChoice, saveInspectChoice, type InspectChoice } from '../../lib/inspectChoice';
import { photoFromFile, pickPhoto, type PickedPhoto } from '../../lib/pickPhoto';
import { ApiError } from '../../lib/api';
import { colors, space } from '../../lib/theme';
import type { Inspection } from '../../shared/api/inspections';
import { AppText } from '../AppText';
import { Button } from '../Button';
import { Card } from '../Card';
import { ErrorBanner } from '../ErrorBanner';
import { Screen } from '../Screen';
import { EmptyState, ErrorState, LoadingState } from '../StateViews';
import { DeliveredList } from './DeliveredList';
import { DisputeDialog } from './DisputeDialog';
import { PhotographButton } from './PhotographButton';
import { QueueBanner } from './QueueBanner';
import { SafetyNote } from './SafetyNote';
import { StationRulePicker } from './StationRulePicker';
import { ruleFitsStation } from './stationRules';
import { UploadProgress } from './UploadProgress';
import { VerdictPanel } from './VerdictPanel';

type Step = { kind: 'ready' } | { kind: 'sending' } | { kind: 'verdict'; inspection: Inspection; photo: PickedPhoto } | { kind: 'queued' };

/** The operator's loop: station and rule once, then photograph, verdict, next part. */
export function InspectScreen() {
  const layout = useLayout();
  const { height } = useWindowDimensions();
  const lines = useLines();
  const rules = useReleasedRules();
  const partTypes = usePartTypes();
  const queue = useQueuedPhotos();
  const inspect = useInspectPhoto();
  const [choice, setChoice] = useState<InspectChoice | null>(() => readInspectChoice());
  const [choosing, setChoosing] = useState(false);
  const [step, setStep] = useState<Step>({ kind: 'ready' });
  const [disputing, setDisputing] = useState(false);
  const [pickError, setPickError] = useState<string>();

  const station = lines.data?.flatMap((line) => line.stations).find((s) => s.id === choice?.stationId && s.active);
  const rememberedRule = rules.data?.find((r) => r.id === choice?.ruleId);
  // A rule for a part type the station no longer inspects is dropped, as the server would refuse it.
  const rule = rememberedRule && station && !ruleFitsStation(rememberedRule, station) ? undefined : rememberedRule;
  // What this device remembered but can no longer use: a withdrawn rule, a station taken out of use.
  const lostRule = Boolean(choice && rules.data && !rememberedRule);
  const lostStation = Boolean(choice && lines.data && !station);
  const misfitRule = Boolean(rememberedRule && station && !rule);

  const send = useCallback(
    (photo: PickedPhoto) => {
      if (!station || !rule?.releasedVersion) return;
      setStep({ kind: 'sending' });
      inspect.mutate(
        { photo: photo.blob, fileName: photo.fileName, stationId: station.id, ruleVersionId: rule.releasedVersion.id, idempotencyKey: newIdempotencyKey() },
        {
          onSuccess: (outcome) => setStep(outcome.kind === 'verdict' ? { kind: 'verdict', inspection: outcome.inspection, photo } : { kind: 'queued' }),
          onError: (error) => {
            setStep({ kind: 'ready' });
            // Refused as out of date (the version was withdrawn or replaced meanwhile): show what is released now.
            if (error instanceof ApiError && error.status === 409) void Promise.all([rules.refetch(), lines.refetch()]);
          },
        },
      );
    },
    [inspect, rule, station, rules, lines],
  );

  const photograph = async () => {
    setPickError(undefined);
    try {
      const photo = await pickPhoto(layout === 'phone' ? 'camera' : 'library');
      if (photo) send(photo);
    } catch {
      setPickError('The photo could not be read. Take it again, or choose a PNG or JPEG file.');
    }
  };
  const dropped = useCallback(
    (file: File) => {
      setPickError(undefined);
      photoFromFile(file).then(send, (error: Error) => setPickError(error.message));
    },
    [send],
  );

  if (lines.isPending || rules.isPending) return <Screen title="Inspect" width="reading"><LoadingState label="Loading stations and released rules…" /></Screen>;
  if (lines.error || rules.error)
    return (
      <Screen title="Inspect" width="reading">
        <ErrorState error={lines.error ?? rules.error} onRetry={() => void Promise.all([lines.refetch(), rules.refetch()])} />
      </Screen>
    );
  if (rules.data.length === 0)
    return (
      <Screen title="Inspect" width="reading">
        <EmptyState title="No released rules to inspect with yet" body="A rule reaches the line once an engineer has tried it and a supervisor has released it. Ask your supervisor which rule your station should use." />
      </Screen>
    );

  const needsChoice = choosing || !station || !rule;
  const queueBanner = <QueueBanner count={queue.count} sending={queue.sending} onSendNow={() => void queue.sendWaiting()} />;

  if (needsChoice)
    return (
      <Screen title="Inspect" subtitle="Choose your station and the released rule for the parts in front of you. This device remembers them." width="reading">
        {queueBanner}
        {!choosing && (lostRule || lostStation || misfitRule) ? (
          <Card style={styles.lost} role="alert">
            <AppText variant="bodyStrong" tone="caution">
              {lostRule
                ? '⚠ The rule this device remembered is no longer released'
                : lostStation
                  ? '⚠ The station this device remembered is no longer in use'
                  : `⚠ ${station?.name} no longer inspects the part type of the rule this device remembered`}
            </AppText>
            <AppText>
              {lostRule
                ? 'A supervisor withdrew it, so it no longer judges parts. Choose the released rule for the parts in front of you, or ask your supervisor which one to use.'
                : lostStation
                  ? 'Choose the station you are working at.'
                  : 'A supervisor changed the part types inspected here. Choose one of the station’s released rules.'}
            </AppText>
          </Card>
        ) : null}
        <StationRulePicker
          lines={lines.data}
          rules={rules.data}
          partTypes={partTypes.data}
          initial={choice}
          onChoose={(next) => {
            saveInspectChoice(next);
            setChoice(next);
            setChoosing(false);
            setStep({ kind: 'ready' });
          }}
        />
      </Screen>
    );

  const context = (
    <Card style={styles.context}>
      <View style={styles.contextText}>
        <AppText variant="bodyStrong">{`${station.name} · ${station.lineName}`}</AppText>
        <AppText variant="caption" tone="muted">{`${rule.name} · released version ${rule.releasedVersion?.number}`}</AppText>
      </View>
      <Button label="Change" variant="quiet" compact onPress={() => setChoosing(true)} accessibilityLabel="Change station or rule" />
    </Card>
  );

  if (step.kind === 'verdict') {
    const { inspection, photo } = step;
    const disputed = inspection.dispute !== null;
    return (
      <Screen title="Verdict" width="reading">
        {queueBanner}
        <VerdictPanel
          inspection={inspection}
          aspectRatio={photo.width > 0 && photo.height > 0 ? photo.width / photo.height : undefined}
          actions={
            <View style={styles.verdictActions}>
              <Button
                label={inspection.verdict === 'RETAKE' ? 'Take a new photo' : 'Next part'}
                onPress={() => (inspection.verdict === 'RETAKE' ? void photograph() : setStep({ kind: 'ready' }))}
                style={styles.bigAction}
              />
              {inspection.verdict === 'RETAKE' ? <Button label="Next part" variant="secondary" onPress={() => setStep({ kind: 'ready' })} /> : null}
              {disputed ? (
                <Card>
                  <AppText variant="bodyStrong">⚑ Disputed</AppText>
                  <AppText>{`Your note: “${inspection.dispute?.note}”. Keep the part aside for a qualified person.`}</AppText>
                </Card>
              ) : (
                <Button label="Dispute verdict" variant="secondary" onPress={() => setDisputing(true)} />
              )}
            </View>
          }
        />
        <SafetyNote />
        <DisputeDialog
          inspection={inspection}
          visible={disputing}
          onClose={() => setDisputing(false)}
          onDisputed={(updated) => {
            setDisputing(false);
            setStep({ kind: 'verdict', inspection: updated, photo });
          }}
        />
      </Screen>
    );
  }

  // With messages above it, the button follows them directly so that it stays on screen.
  const busyScreen = queue.count > 0 || queue.delivered.length > 0 || queue.refused.length > 0 || step.kind === 'queued' || Boolean(inspect.error) || Boolean(pickError);
  return (
    <Screen title="Inspect" width="reading">
      {context}
      {queueBanner}
      <DeliveredList delivered={queue.delivered} refused={queue.refused} onDismiss={() => { queue.dismissDelivered(); queue.dismissRefused(); }} />
      {step.kind === 'queued' && queue.count > 0 ? (
        <Card>
          <AppText variant="heading">◷ Photo kept on this device</AppText>
          <AppText>Its verdict appears here once the server answers. Keep the part aside until then.</AppText>
        </Card>
      ) : null}
      {inspect.error ? <ErrorBanner error={inspect.error} /> : null}
      {pickError ? <ErrorBanner error={null} message={pickError} nextStep="Try again." /> : null}
      {/* One-handed use: the main button sits in the lower half of a phone screen. */}
      <View style={[styles.lower, layout === 'phone' && !busyScreen && { minHeight: height * 0.45 }]}>
        {step.kind === 'sending' ? (
          <UploadProgress fraction={inspect.progress} />
        ) : (
          <PhotographButton
            label="Photograph part"
            hint={layout === 'phone' ? 'Opens the camera.' : 'Choose the part’s photo.'}
            onPress={() => void photograph()}
            onDropFile={dropped}
          />
        )}
      </View>
      <SafetyNote />
    </Screen>
  );
}

const styles = StyleSheet.create({
  context: { flexDirection: 'row', alignItems: 'center', justifyContent: 'space-between', gap: space.md },
  contextText: { flexShrink: 1, gap: space.xxs },
  lower: { justifyContent: 'flex-end', gap: space.md },
  verdictActions: { gap: space.sm },
  bigAction: { minHeight: 64 },
  lost: { gap: space.xs, borderLeftWidth: 4, borderLeftColor: colors.caution },
});
