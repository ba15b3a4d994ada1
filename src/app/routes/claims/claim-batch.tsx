import { BatchImport } from '../../../features/claims/components/batch-import';
import { useAbility } from '../../../lib/ability';
import { NotFoundRoute } from '../not-found';

export function ClaimBatchRoute() {
  const ability = useAbility();
  if (!ability.can('create', 'Claim')) return <NotFoundRoute />;
  return <BatchImport />;
}
