import { MailboxList } from '../../../features/mailbox/components/mailbox-list';
import { useAbility } from '../../../lib/ability';
import { NotFoundRoute } from '../not-found';

export function MailboxRoute() {
  const ability = useAbility();
  if (!ability.can('read', 'Mailbox')) return <NotFoundRoute />;
  return <MailboxList />;
}
