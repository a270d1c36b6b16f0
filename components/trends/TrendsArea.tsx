import { useState } from 'react';
import { useLocalSearchParams, useRouter } from 'expo-router';
import { useAlertPages } from '../../hooks/useAlerts';
import { useLayout } from '../../hooks/useLayout';
import { useSession } from '../../hooks/useSession';
import { useTrendChoices } from '../../hooks/useTrends';
import { Screen } from '../Screen';
import { EmptyState, ErrorState, LoadingState } from '../StateViews';
import { AgreementView } from './AgreementView';
import { AlertsView } from './AlertsView';
import { ChartsView } from './ChartsView';
import { SectionTabs, type Section } from './SectionTabs';
import { DEFAULT_TREND_FILTERS, type TrendFilterValues } from './trendFilters';

type SectionKey = 'chart' | 'causes' | 'alerts' | 'agreement';

const SECTION_KEYS: readonly SectionKey[] = ['chart', 'causes', 'alerts', 'agreement'];

/** The supervisor's view of the line: control chart and causes, alerts, and agreement studies. */
export function TrendsArea() {
  const phone = useLayout() === 'phone';
  const router = useRouter();
  const params = useLocalSearchParams<{ section?: string }>();
  const { user } = useSession();
  const isSupervisor = !!user?.roles.includes('supervisor');
  const runsStudies = isSupervisor || !!user?.roles.includes('engineer');
  const choices = useTrendChoices();
  const openAlerts = useAlertPages('open');
  const [filters, setFilters] = useState<TrendFilterValues>(DEFAULT_TREND_FILTERS);

  const asked = SECTION_KEYS.find((k) => k === params.section) ?? 'chart';
  // A wide screen shows the control chart and the causes together.
  const section: SectionKey = !phone && asked === 'causes' ? 'chart' : asked;
  const openCount = openAlerts.data?.pages.flatMap((p) => p.items).length;
  const openMore = !!openAlerts.hasNextPage;
  const alertsTab: Section<SectionKey> = { key: 'alerts', title: 'Alerts', count: openCount, countLabel: openMore ? 'or more open' : 'open' };
  const sections: Section<SectionKey>[] = phone
    ? [{ key: 'chart', title: 'Control chart' }, { key: 'causes', title: 'Causes' }, alertsTab, { key: 'agreement', title: 'Agreement' }]
    : [{ key: 'chart', title: 'Control chart and causes' }, alertsTab, { key: 'agreement', title: 'Agreement' }];

  let body;
  if (choices.isPending) body = <LoadingState label="Loading rules, lines and stations…" />;
  else if (choices.isError) body = <ErrorState error={choices.error} onRetry={() => choices.refetch()} />;
  else if (choices.data.lines.length === 0)
    body = <EmptyState title="No stations to chart yet" body="Trends appear once stations exist and operators judge parts there. Set up the lines and stations in Stations." />;
  else if (section === 'alerts') body = <AlertsView choices={choices.data} isSupervisor={isSupervisor} phone={phone} openCount={openCount} />;
  else if (section === 'agreement') body = <AgreementView choices={choices.data} canRun={runsStudies} />;
  else body = <ChartsView values={filters} onChange={setFilters} choices={choices.data} phone={phone} shown={phone ? (section === 'causes' ? 'causes' : 'control-chart') : 'both'} />;

  return (
    <Screen title="Trends" subtitle="Is each line in control, and why do parts fail? Defect rates on p-charts with run rules, causes ranked by count, alerts, and agreement studies.">
      <SectionTabs label="Parts of Trends" sections={sections} value={section} onChange={(key) => router.setParams({ section: key })} />
      {body}
    </Screen>
  );
}
