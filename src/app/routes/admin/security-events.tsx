import { SecurityEvents } from '../../../features/security/components/security-events-table';
import { useAbility } from '../../../lib/ability';
import { NotFoundRoute } from '../not-found';

export function SecurityEventsRoute() {
  const ability = useAbility();
  if (!ability.can('read', 'AuditEvent')) return <NotFoundRoute />;
  return <SecurityEvents />;
}
