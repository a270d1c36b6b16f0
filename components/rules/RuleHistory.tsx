// A rule's change history for auditors (and everyone who reads rules): every version with what changed
// from the one before, its signatures, its trials and every state change from the audit trail.
import { useRouter } from 'expo-router';
import { useState, type ReactNode } from 'react';
import { StyleSheet, View } from 'react-native';
import { useLayout } from '../../hooks/useLayout';
import { useRuleHistory } from '../../hooks/useRuleHistory';
import { useSession } from '../../hooks/useSession';
import { colors, radius, space } from '../../lib/theme';
import type { RuleHistoryEvent, RuleHistoryTrial, RuleHistoryVersion } from '../../shared/api/rule-history';
import { SIGNATURE_MEANING_LABELS } from '../../shared/api/rules';
import { AppText } from '../AppText';
import { Button } from '../Button';
import { Card } from '../Card';
import { ExportButton } from '../records/ExportButton';
import { SignatureList } from '../review/SignatureList';
import { VersionState } from './VersionState';
import { isSentBack } from '../../shared/api/rules';
import { Screen } from '../Screen';
import { EmptyState, ErrorState, LoadingState } from '../StateViews';

// Symbols the shipped font has, so that they print the same everywhere.
const CHANGE_WORDS = { changed: '• changed', added: '+ added', removed: '− removed', same: '' } as const;

// Date, time and time zone, so that a moment in the history reads the same wherever it is opened.
const momentFormat = new Intl.DateTimeFormat(undefined, { dateStyle: 'medium', timeStyle: 'long' });

function when(iso: string | null): string {
  return iso ? momentFormat.format(new Date(iso)) : '—';
}

function percent(rate: number | null): string {
  return rate === null ? '—' : `${(rate * 100).toFixed(1)} %`;
}

function meaningWords(meaning: string): string {
  return SIGNATURE_MEANING_LABELS[meaning as keyof typeof SIGNATURE_MEANING_LABELS] ?? meaning;
}

function Section({ title, children }: { title: string; children: ReactNode }) {
  return (
    <View style={styles.section}>
      <AppText variant="bodyStrong" role="heading" aria-level={3}>
        {title}
      </AppText>
      {children}
    </View>
  );
}

function Changes({ version }: { version: RuleHistoryVersion }) {
  const wide = useLayout() === 'wide';
  const changes = version.changes;
  if (!changes) return <AppText tone="muted">The first version: there is nothing before it to compare with.</AppText>;
  if (changes.rows.length === 0) return <AppText tone="muted">{`Same content as version ${changes.fromNumber}.`}</AppText>;
  return (
    <View role="list" aria-label={`Changes from version ${changes.fromNumber} to version ${version.number}`}>
      <AppText tone="muted">{`${changes.rows.length} difference${changes.rows.length === 1 ? '' : 's'} from version ${changes.fromNumber}.`}</AppText>
      {changes.rows.map((row) => (
        <View key={`${row.section}-${row.label}`} role="listitem" style={[styles.change, wide && styles.changeWide]}>
          <View style={wide ? styles.changeLabelWide : undefined}>
            <AppText variant="label">{`${row.section} · ${row.label}`}</AppText>
            <AppText variant="caption" tone="caution">
              {CHANGE_WORDS[row.change]}
            </AppText>
          </View>
          <AppText style={wide && styles.changeCell} tone={row.before === null ? 'muted' : 'default'} selectable>
            {`Version ${changes.fromNumber}: ${row.before ?? '(none)'}`}
          </AppText>
          <AppText style={wide && styles.changeCell} tone={row.after === null ? 'muted' : 'default'} selectable>
            {`Version ${version.number}: ${row.after ?? '(none)'}`}
          </AppText>
        </View>
      ))}
    </View>
  );
}

function TrialLine({ trial }: { trial: RuleHistoryTrial }) {
  const marks = [trial.submitted ? '✓ submitted with this version' : '', trial.onCurrentContent ? '' : '↺ ran on earlier content of the draft'].filter(Boolean).join(' · ');
  return (
    <View role="listitem" style={styles.item}>
      <AppText variant="label">{`“${trial.referenceSetName}” · ${trial.state === 'done' ? `finished ${when(trial.finishedAt)}` : trial.state} · started by ${trial.startedBy.name}`}</AppText>
      {trial.state === 'done' && trial.images !== null ? (
        <AppText>{`${trial.images} photos · false reject rate ${percent(trial.falseRejectRate)} · escape rate ${percent(trial.escapeRate)} · agreement ${percent(trial.agreement)} · kappa ${trial.kappa === null ? '—' : trial.kappa.toFixed(2)}`}</AppText>
      ) : null}
      {marks ? (
        <AppText variant="caption" tone="muted">
          {marks}
        </AppText>
      ) : null}
    </View>
  );
}

function EventLine({ event }: { event: RuleHistoryEvent }) {
  const extra = [event.fromVersion !== null ? `from version ${event.fromVersion}` : '', event.meaning ? `meaning: ${meaningWords(event.meaning)}` : '', event.note ? `“${event.note}”` : '']
    .filter(Boolean)
    .join(' · ');
  return (
    <View role="listitem" style={styles.event}>
      <AppText variant="caption" tone="muted" style={styles.eventTime}>
        {when(event.occurredAt)}
      </AppText>
      <View style={styles.eventBody}>
        <AppText variant="label">{`${event.label} — ${event.actor.name}`}</AppText>
        {extra ? <AppText variant="caption">{extra}</AppText> : null}
        <AppText variant="caption" tone="muted" selectable>{`audit event ${event.seq}`}</AppText>
      </View>
    </View>
  );
}

function VersionCard({ version, open, canPrint, focused }: { version: RuleHistoryVersion; open: boolean; canPrint: boolean; focused: boolean }) {
  const [expanded, setExpanded] = useState(open);
  const facts = [
    `Author ${version.author.name}, last edited ${when(version.editedAt)}`,
    version.submittedAt ? `submitted ${when(version.submittedAt)}` : '',
    version.releasedAt ? `released ${when(version.releasedAt)}${version.reviewer ? ` by ${version.reviewer.name}` : ''}` : '',
    version.endedAt ? `in force until ${when(version.endedAt)}` : '',
  ].filter(Boolean);
  return (
    <Card style={[styles.card, focused && styles.focused]}>
      <View style={styles.header}>
        <AppText variant="heading">{`Version ${version.number}`}</AppText>
        <VersionState state={version.state} sentBack={isSentBack(version)} />
      </View>
      {focused ? <AppText tone="notice" variant="label">→ The version the inspection you came from was judged with.</AppText> : null}
      <AppText>{facts.join(' · ')}</AppText>
      {version.authorNote ? <AppText>{`Author’s note: “${version.authorNote}”`}</AppText> : null}
      {version.reviewNote ? <AppText>{`Review note: “${version.reviewNote}”`}</AppText> : null}
      {version.withdrawReason ? <AppText>{`Withdrawn because: “${version.withdrawReason}”`}</AppText> : null}
      <AppText variant="caption" tone="muted" selectable>{`Content SHA-256 ${version.contentHash}`}</AppText>
      <View style={styles.buttons}>
        <Button
          label={expanded ? 'Hide details' : 'Show changes, signatures, trials and events'}
          variant="quiet"
          compact
          accessibilityLabel={`${expanded ? 'Hide' : 'Show'} the details of version ${version.number}`}
          onPress={() => setExpanded((e) => !e)}
        />
        {canPrint ? <ExportButton label={`Version ${version.number} report (PDF)`} path={`/api/records/rule-versions/${version.id}/report.pdf`} fallbackName={`rule-version-${version.number}.pdf`} /> : null}
      </View>
      {expanded ? (
        <View style={styles.details}>
          <Section title={version.changes ? `What changed from version ${version.changes.fromNumber}` : 'What changed'}>
            <Changes version={version} />
          </Section>
          <Section title="Signatures">
            <SignatureList signatures={version.signatures} />
          </Section>
          <Section title="Trials">
            {version.trials.length === 0 ? (
              <AppText tone="muted">No trial was run on this version.</AppText>
            ) : (
              <View role="list" aria-label={`Trials of version ${version.number}`} style={styles.list}>
                {version.trials.map((trial) => (
                  <TrialLine key={trial.id} trial={trial} />
                ))}
              </View>
            )}
          </Section>
          <Section title="State changes and other events">
            {version.events.length === 0 ? (
              <AppText tone="muted">The audit trail holds no events for this version.</AppText>
            ) : (
              <View role="list" aria-label={`Events of version ${version.number}`}>
                {version.events.map((event) => (
                  <EventLine key={event.seq} event={event} />
                ))}
              </View>
            )}
          </Section>
        </View>
      ) : null}
    </Card>
  );
}

/** The history screen of one rule; `focusVersionId` opens and marks one version (from an inspection record). */
export function RuleHistory({ ruleId, focusVersionId }: { ruleId: string; focusVersionId?: string }) {
  const router = useRouter();
  const { user } = useSession();
  const history = useRuleHistory(ruleId);
  // The printed reports live in the records area: auditors and supervisors.
  const canPrint = !!user?.roles.some((role) => role === 'auditor' || role === 'supervisor');
  const back = <Button label="Rule page" variant="secondary" onPress={() => router.push(`/rules/${ruleId}`)} />;

  if (history.isPending) {
    return (
      <Screen title="Rule history">
        <LoadingState label="Loading the rule’s history…" />
      </Screen>
    );
  }
  if (history.isError) {
    return (
      <Screen title="Rule history" actions={<Button label="All rules" variant="secondary" onPress={() => router.push('/rules')} />}>
        <ErrorState error={history.error} onRetry={() => void history.refetch()} />
      </Screen>
    );
  }
  const { rule, versions, events } = history.data;
  const created = events.find((e) => e.action === 'rule.create');
  return (
    <Screen
      title={`History of ${rule.name}`}
      subtitle={`${versions.length} version${versions.length === 1 ? '' : 's'} · rule created by ${created?.actor.name ?? rule.createdBy.name}, ${when(created?.occurredAt ?? rule.createdAt)}`}
      actions={back}
    >
      <AppText tone="muted">
        Every version is kept as it was. State changes come from the audit trail; signatures are checked against each version’s content every time this page
        loads.
      </AppText>
      {versions.length === 0 ? (
        <EmptyState title="No versions yet" body="A rule gets its first version when an engineer creates it. Open the rule page to see it." action={back} />
      ) : (
        versions.map((version, index) => (
          <VersionCard
            key={version.id}
            version={version}
            open={focusVersionId ? version.id === focusVersionId : index === 0}
            focused={version.id === focusVersionId}
            canPrint={canPrint}
          />
        ))
      )}
    </Screen>
  );
}

const styles = StyleSheet.create({
  card: { gap: space.sm },
  focused: { borderColor: colors.steel, borderWidth: 2 },
  header: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', gap: space.sm },
  buttons: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm, alignItems: 'flex-start' },
  details: { gap: space.lg, marginTop: space.sm },
  section: { gap: space.xs },
  list: { gap: space.sm },
  item: { gap: space.xxs, padding: space.md, borderRadius: radius.md, borderWidth: 1, borderColor: colors.line },
  change: { gap: space.xxs, paddingVertical: space.sm, paddingHorizontal: space.sm, borderBottomWidth: 1, borderColor: colors.line, borderLeftWidth: 4, borderLeftColor: colors.caution },
  changeWide: { flexDirection: 'row', gap: space.md },
  changeLabelWide: { flexBasis: 200, flexShrink: 0 },
  changeCell: { flex: 1 },
  event: { flexDirection: 'row', flexWrap: 'wrap', gap: space.md, paddingVertical: space.sm, borderBottomWidth: 1, borderColor: colors.line },
  eventTime: { flexBasis: 170, flexShrink: 0 },
  eventBody: { flex: 1, minWidth: 200, gap: space.xxs },
});
