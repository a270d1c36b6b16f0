import { AreaGate } from '../../../components/AreaGate';
import { ReferenceSetsList } from '../../../components/references/ReferenceSetsList';

export default function ReferenceSetsRoute() {
  return (
    <AreaGate area="reference-sets">
      <ReferenceSetsList />
    </AreaGate>
  );
}
