import { ClaimsList } from '../../../features/claims/components/claims-list';
import { useAbility } from '../../../lib/ability';

export function ClaimsRoute() {
  const ability = useAbility();
  return <ClaimsList canCreate={ability.can('create', 'Claim')} />;
}
