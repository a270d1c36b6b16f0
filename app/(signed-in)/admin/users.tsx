import { AreaGate } from '../../../components/AreaGate';
import { UsersAdmin } from '../../../components/users/UsersAdmin';

export default function UsersRoute() {
  return (
    <AreaGate area="users">
      <UsersAdmin />
    </AreaGate>
  );
}
