import { findArea, type AreaKey } from '../lib/navigation';
import { AreaGate } from './AreaGate';
import { Screen } from './Screen';
import { EmptyState } from './StateViews';

/** An area whose records do not exist yet: its name, and an honest word on what will appear there. */
export function AreaEmptyScreen({ area }: { area: AreaKey }) {
  const { title, emptyTitle, purpose } = findArea(area);
  return (
    <AreaGate area={area}>
      <Screen title={title} width="reading">
        <EmptyState title={emptyTitle} body={purpose} />
      </Screen>
    </AreaGate>
  );
}
