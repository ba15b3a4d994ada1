import { CreditApprovalSetting } from '../../../features/users/components/credit-approval-setting';
import { UsersAdmin } from '../../../features/users/components/users-table';
import { useAbility } from '../../../lib/ability';
import { NotFoundRoute } from '../not-found';

export function UsersRoute() {
  const ability = useAbility();
  if (!ability.can('invite', 'User')) return <NotFoundRoute />;
  return (
    <>
      <UsersAdmin />
      {ability.can('update', 'Organization') ? <CreditApprovalSetting /> : null}
    </>
  );
}
