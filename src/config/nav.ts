import {
  Activity,
  ClipboardCheck,
  ClipboardList,
  Home,
  Hourglass,
  Inbox,
  Landmark,
  Lightbulb,
  MapPin,
  Receipt,
  ShieldAlert,
  Plug,
  Users,
  type LucideIcon,
} from 'lucide-react';
import type { AppAbility } from '../../shared/abilities';

export type NavItem = { to: string; label: string; icon: LucideIcon; end?: boolean };

/** The navigation a user sees: only what their abilities allow. */
export function navFor(ability: AppAbility): NavItem[] {
  const items: NavItem[] = [{ to: '/', label: 'Home', icon: Home, end: true }];
  if (ability.can('read', 'Claim')) items.push({ to: '/claims', label: 'Claims', icon: ClipboardList });
  if (ability.can('read', 'ProductModel'))
    items.push({ to: '/catalogue', label: 'Catalogue', icon: Lightbulb });
  if (ability.can('read', 'Installation')) items.push({ to: '/installations', label: 'Sites', icon: MapPin });
  if (ability.can('review', 'Claim'))
    items.push({ to: '/review', label: 'Review desk', icon: ClipboardCheck });
  if (ability.can('read', 'CreditMemo')) items.push({ to: '/credits', label: 'Credits', icon: Receipt });
  if (ability.can('read', 'Analytics'))
    items.push({ to: '/analytics', label: 'Failure analysis', icon: Activity });
  if (ability.can('read', 'Reserve')) items.push({ to: '/reserve', label: 'Reserve', icon: Landmark });
  if (ability.can('read', 'Ageing')) items.push({ to: '/ageing', label: 'Ageing', icon: Hourglass });
  if (ability.can('invite', 'User')) items.push({ to: '/admin/users', label: 'People', icon: Users });
  if (ability.can('read', 'AuditEvent'))
    items.push({ to: '/admin/security-events', label: 'Security events', icon: ShieldAlert });
  if (ability.can('read', 'ApiToken'))
    items.push({ to: '/admin/integrations', label: 'Integrations', icon: Plug });
  if (ability.can('read', 'Mailbox')) items.push({ to: '/admin/mailbox', label: 'Mailbox', icon: Inbox });
  return items;
}
