import type { SecurityEventAction, SecurityEventDto } from '../../../shared/schemas/security';
import { isoOfDateTime } from '../../db/read';
import type { SecurityEventRow } from './security-events.service';

function ipOf(after: string | Record<string, unknown> | null): string | null {
  if (!after) return null;
  try {
    const v = (typeof after === 'string' ? (JSON.parse(after) as { ip?: unknown }) : after).ip;
    return typeof v === 'string' ? v : null;
  } catch {
    return null;
  }
}

/** An audit entry as the security events page shows it: a role change under its own name, the address it came from. */
export function presentSecurityEvent(row: SecurityEventRow): SecurityEventDto {
  const subject =
    row.entity_type === 'User' && row.s_name
      ? { id: row.entity_id, name: row.s_name, email: row.s_email ?? '' }
      : null;
  return {
    id: String(row.id),
    occurredAt: isoOfDateTime(row.occurred_at),
    action: (row.action === 'user.updated' ? 'user.roles_changed' : row.action) as SecurityEventAction,
    subject,
    actor:
      row.actor_user_id && row.a_name && row.actor_user_id !== subject?.id
        ? { id: row.actor_user_id, name: row.a_name }
        : null,
    ip: ipOf(row.after_state),
  };
}
