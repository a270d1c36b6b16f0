import { Link, useLocalSearchParams, useRouter } from 'expo-router';
import { formatDateTime } from '../../lib/format';
import { useMemo, useState } from 'react';
import { Pressable, StyleSheet, View } from 'react-native';
import { useLayout } from '../../hooks/useLayout';
import { useRecordPages, type RecordFilterValues } from '../../hooks/useRecords';
import { usePartTypeName } from '../../hooks/useReferenceSets';
import { useSession } from '../../hooks/useSession';
import { useRule } from '../../hooks/useRules';
import { useLines } from '../../hooks/useStations';
import { colors, minTouchTarget, radius, space } from '../../lib/theme';
import { recordReference, recordReferenceSchema, type RecordRow } from '../../shared/api/records';
import { AppText } from '../AppText';
import { Button } from '../Button';
import { Card } from '../Card';
import { ChoiceChips } from '../ChoiceChips';
import { VerdictMark } from '../inspect/VerdictMark';
import { FilterPanel } from '../FilterPanel';
import { describeRecordFilters } from './recordFilterSummary';
import { Screen } from '../Screen';
import { EmptyState, ErrorState, LoadingState } from '../StateViews';
import { TextField } from '../TextField';
import { AuditTrailCard } from './AuditTrailCard';
import { dayAfterIso, dayStartIso, rangeProblem, readDay } from './dateFilter';
import { ExportButton } from './ExportButton';

type Verdict = NonNullable<RecordFilterValues['verdict']>;

/** The verdict mark's size on a record's row (px). */
const RECORD_MARK = 28;


/** Filters a link brings in the address (a chart point, a cause, an alert): /records?from=…&cause=…. */
type LinkParams = Partial<Record<'from' | 'to' | 'lineId' | 'stationId' | 'ruleId' | 'verdict' | 'partType' | 'cause', string>>;
/** Those without a control of their own on this screen, shown as one line that can be cleared. */
type LinkedFilters = Pick<RecordFilterValues, 'from' | 'to' | 'lineId' | 'ruleId' | 'partType' | 'cause'>;

const isIsoTime = (text: string | undefined): text is string => !!text && /^\d{4}-\d{2}-\d{2}T/.test(text) && !Number.isNaN(Date.parse(text));
const isMidnight = (iso: string) => iso.slice(11, 19) === '00:00:00';

/** Whole days from the link fill the date fields; other bounds (a shift) stay exact, as a linked filter. */
function initialFilters(params: LinkParams) {
  const verdicts: readonly string[] = ['PASS', 'FAIL', 'RETAKE'];
  const fromIso = isIsoTime(params.from) ? new Date(params.from).toISOString() : undefined;
  const toIso = isIsoTime(params.to) ? new Date(params.to).toISOString() : undefined;
  const wholeDays = (!fromIso || isMidnight(fromIso)) && (!toIso || isMidnight(toIso));
  const linked: LinkedFilters = { lineId: params.lineId, ruleId: params.ruleId, partType: params.partType, cause: params.cause };
  if (!wholeDays) Object.assign(linked, { from: fromIso, to: toIso });
  return {
    verdict: params.verdict && verdicts.includes(params.verdict) ? (params.verdict as Verdict) : null,
    stationId: params.stationId ?? null,
    from: wholeDays && fromIso ? fromIso.slice(0, 10) : '',
    to: wholeDays && toIso ? new Date(Date.parse(toIso) - 86_400_000).toISOString().slice(0, 10) : '',
    linked,
  };
}

function RuleNameText({ id }: { id: string }) {
  const rule = useRule(id);
  return <>{rule.data ? `rule ${rule.data.name}` : 'one rule'}</>;
}

function LinkedFiltersNote({ linked, lineName, onClear }: { linked: LinkedFilters; lineName: string | undefined; onClear: () => void }) {
  const partTypeName = usePartTypeName();
  const time = (iso: string) => `${iso.slice(0, 10)} ${iso.slice(11, 16)} UTC`;
  const parts = [
    linked.lineId ? (lineName ?? 'one line') : null,
    linked.partType ? `part type ${partTypeName(linked.partType)}` : null,
    linked.cause ? `cause “${linked.cause}”` : null,
    linked.from || linked.to ? `${linked.from ? time(linked.from) : '…'} to ${linked.to ? time(linked.to) : '…'}` : null,
  ].filter(Boolean);
  return (
    <View style={styles.linked}>
      <AppText style={styles.linkedText}>
        {'Also filtered by the link you followed: '}
        {linked.ruleId ? <RuleNameText id={linked.ruleId} /> : null}
        {linked.ruleId && parts.length > 0 ? ', ' : ''}
        {parts.join(', ')}
      </AppText>
      <Button label="Clear these" variant="quiet" compact accessibilityLabel="Clear the filters from the link" onPress={onClear} />
    </View>
  );
}

function RecordLine({ row, phone }: { row: RecordRow; phone: boolean }) {
  return (
    <Link href={`/records/${row.id}`} asChild>
      <Pressable accessibilityRole="link" accessibilityLabel={`${row.verdict}, ${row.ruleName} at ${row.stationName}, ${formatDateTime(row.createdAt)}, record ${recordReference(row.id)}`} style={StyleSheet.flatten([styles.row, phone && styles.rowPhone])}>
        <VerdictMark verdict={row.verdict} size={RECORD_MARK} />
        <View style={styles.cellMain}>
          <AppText variant="bodyStrong">{`${row.verdict}${row.cause ? ` · ${row.cause}` : ''}${row.disputed ? ' · disputed' : ''}`}</AppText>
          <AppText variant="caption" tone="muted">{`${row.ruleName} v${row.ruleVersionNumber} · ${row.lineName}, ${row.stationName}`}</AppText>
        </View>
        <View style={[styles.cellSide, phone && styles.cellSidePhone]}>
          <AppText variant="caption">{formatDateTime(row.createdAt)}</AppText>
          <AppText variant="caption" tone="muted">
            {`${row.operatorName} · record ${recordReference(row.id)}`}
          </AppText>
        </View>
      </Pressable>
    </Link>
  );
}

/** Inspection records: filters (first taken from the address), keyset pages, CSV export, and the audit trail's verification. */
export function RecordsScreen() {
  const params = useLocalSearchParams<LinkParams>();
  // A new link while the screen is open starts again from its filters.
  return <RecordsList key={JSON.stringify(params)} params={params} />;
}

function RecordsList({ params }: { params: LinkParams }) {
  const router = useRouter();
  const phone = useLayout() === 'phone';
  const { user } = useSession();
  const readsTrail = !!user?.roles.some((r) => r === 'auditor' || r === 'admin');
  const lines = useLines();
  const [initial] = useState(() => initialFilters(params));
  const [verdict, setVerdict] = useState<Verdict | null>(initial.verdict);
  const [stationId, setStationId] = useState<string | null>(initial.stationId);
  const [disputed, setDisputed] = useState<boolean | null>(null);
  const [from, setFrom] = useState(initial.from);
  const [to, setTo] = useState(initial.to);
  const [linked, setLinked] = useState<LinkedFilters>(initial.linked);
  // A field the person has left reports a part-typed date as well.
  const [leftField, setLeftField] = useState({ from: false, to: false });
  const fromDay = readDay(from, leftField.from);
  const toDay = readDay(to, leftField.to);
  const datesProblem = rangeProblem(fromDay.day, toDay.day);
  const [reference, setReference] = useState('');
  const readReference = reference.trim() === '' ? null : recordReferenceSchema.safeParse(reference);
  const refFilter = readReference?.success ? readReference.data : undefined;
  const referenceProblem = readReference === null || readReference.success ? null : 'A record reference is eight letters A–F and digits, e.g. 7F3A-19C2.';
  const filterProblem = fromDay.problem ?? toDay.problem ?? datesProblem ?? referenceProblem;
  const filters: RecordFilterValues = useMemo(
    () => ({
      verdict: verdict ?? undefined,
      stationId: stationId ?? undefined,
      disputed: disputed === null ? undefined : disputed ? 'true' : 'false',
      from: linked.from ?? (fromDay.day ? dayStartIso(fromDay.day) : undefined),
      to: linked.to ?? (toDay.day ? dayAfterIso(toDay.day) : undefined),
      lineId: linked.lineId,
      ruleId: linked.ruleId,
      partType: linked.partType,
      cause: linked.cause,
      ref: refFilter,
    }),
    [verdict, stationId, disputed, fromDay.day, toDay.day, linked, refFilter],
  );
  const hasLinked = Object.values(linked).some(Boolean);
  // Typing a date replaces the exact bounds a link brought.
  const typeDate = (set: (text: string) => void) => (text: string) => {
    set(text);
    setLinked((l) => ({ ...l, from: undefined, to: undefined }));
  };
  const pages = useRecordPages(filters);
  const rows = pages.data?.pages.flatMap((p) => p.items) ?? [];
  const stations = (lines.data ?? []).flatMap((l) => l.stations.map((s) => ({ value: s.id, label: `${s.name}` })));
  const exportQuery = Object.fromEntries(Object.entries(filters).map(([k, v]) => [k, v === undefined ? undefined : String(v)]));

  return (
    <Screen
      title="Records"
      subtitle="Every inspection, as recorded: who, where, which rule version, the verdict and its measurements."
      actions={
        <>
          <Button label="Rule history" variant="secondary" compact accessibilityLabel="Rule history: every rule’s versions, signatures and changes" onPress={() => router.push('/records/rule-history')} />
          <ExportButton
            label="Export CSV"
            path="/api/records/inspections.csv"
            query={exportQuery}
            fallbackName="inspections.csv"
            countHeader="X-Inspection-Count"
            unavailable={filterProblem ? 'Correct the filters first: the export holds what the list shows.' : undefined}
            describeSaved={(fileName, count) =>
              `Saved ${fileName}${count === null ? '' : `: ${count.toLocaleString()} inspection${count === 1 ? '' : 's'}`}, one row per gauge measured (an inspection without gauges has one row).`
            }
          />
        </>
      }
    >
      <FilterPanel
        foldable={phone}
        summary={describeRecordFilters({ verdict, stationName: stations.find((s) => s.value === stationId)?.label ?? null, disputed, from, to, reference: reference.trim() })}
      >
        <TextField
          label="Record reference (from the part’s tag)"
          value={reference}
          onChangeText={setReference}
          error={referenceProblem ?? undefined}
          placeholder="7F3A-19C2"
          autoCapitalize="characters"
          autoCorrect={false}
        />
        <ChoiceChips<Verdict | null>
          label="Verdict"
          value={verdict}
          onChange={setVerdict}
          choices={[
            { value: null, label: 'All' },
            { value: 'PASS', label: 'PASS' },
            { value: 'FAIL', label: 'FAIL' },
            { value: 'RETAKE', label: 'RETAKE' },
          ]}
        />
        {stations.length > 0 ? <ChoiceChips<string | null> label="Station" value={stationId} onChange={setStationId} choices={[{ value: null, label: 'All' }, ...stations]} /> : null}
        <ChoiceChips<boolean | null> label="Disputed" value={disputed} onChange={setDisputed} choices={[{ value: null, label: 'Either' }, { value: true, label: 'Disputed' }, { value: false, label: 'Not disputed' }]} />
        <View style={[styles.dates, phone && styles.datesPhone]}>
          <View style={phone ? null : styles.dateField}>
            <TextField
              label="From (YYYY-MM-DD, UTC)"
              value={from}
              onChangeText={typeDate(setFrom)}
              onBlur={() => setLeftField((f) => ({ ...f, from: true }))}
              error={fromDay.problem ?? undefined}
              placeholder="2026-11-01"
              autoCapitalize="none"
            />
          </View>
          <View style={phone ? null : styles.dateField}>
            <TextField
              label="To (inclusive)"
              value={to}
              onChangeText={typeDate(setTo)}
              onBlur={() => setLeftField((f) => ({ ...f, to: true }))}
              error={toDay.problem ?? datesProblem ?? undefined}
              placeholder="2026-11-30"
              autoCapitalize="none"
            />
          </View>
        </View>
      </FilterPanel>
      {/* Outside the panel, so that a folded panel on a phone still says what the link narrowed. */}
      {hasLinked ? <LinkedFiltersNote linked={linked} lineName={lines.data?.find((l) => l.id === linked.lineId)?.name} onClear={() => setLinked({})} /> : null}

      {filterProblem ? (
        <EmptyState title="Check the filters" body={`${filterProblem} No inspections are listed until the filters can be read.`} />
      ) : pages.isPending ? (
        <LoadingState label="Loading inspections…" />
      ) : pages.isError ? (
        <ErrorState error={pages.error} onRetry={() => pages.refetch()} />
      ) : rows.length === 0 ? (
        <EmptyState title="No inspections match" body="Widen the dates or clear a filter. Inspections appear here as operators judge parts at the stations." />
      ) : (
        <Card style={styles.list}>
          <AppText variant="caption" tone="muted">{`${rows.length} shown, newest first${pages.hasNextPage ? '; more below' : ''}`}</AppText>
          {rows.map((row) => (
            <RecordLine key={row.id} row={row} phone={phone} />
          ))}
          {pages.hasNextPage ? <Button label="Show older inspections" variant="secondary" busy={pages.isFetchingNextPage} onPress={() => pages.fetchNextPage()} /> : null}
        </Card>
      )}

      {readsTrail ? <AuditTrailCard /> : null}
    </Screen>
  );
}

const styles = StyleSheet.create({
  dates: { flexDirection: 'row', gap: space.md },
  datesPhone: { flexDirection: 'column' },
  dateField: { flex: 1, maxWidth: 360 },
  list: { gap: space.xs },
  row: { flexDirection: 'row', alignItems: 'center', gap: space.md, minHeight: minTouchTarget, paddingVertical: space.sm, paddingHorizontal: space.sm, borderRadius: radius.md, borderBottomWidth: 1, borderBottomColor: colors.line },
  rowPhone: { flexWrap: 'wrap' },
  cellMain: { flex: 1, minWidth: 180, gap: space.xxs },
  cellSide: { alignItems: 'flex-end', gap: space.xxs },
  // On a phone the time and operator wrap under the verdict, lined up with its text (after the mark).
  cellSidePhone: { alignItems: 'flex-start', flexBasis: '100%', paddingLeft: RECORD_MARK + space.md },
  linked: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', gap: space.sm, padding: space.sm, borderRadius: radius.md, backgroundColor: colors.steelTint },
  linkedText: { flexGrow: 1, flexShrink: 1, flexBasis: 220 },
});
