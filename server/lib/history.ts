import type { HistoryEventDto } from '../../shared/schemas/catalogue';
import type { AppDataSource } from '../db/data-source';
import { readRows } from '../db/read';

/**
 * The audit trail of one record, oldest first. The caller has already authorised reading the record. People
 * are named to viewers of their own organisation; others see only the organisation.
 */
export async function loadHistory(
  ds: AppDataSource,
  entityType: string,
  entityId: string,
  viewerOrgId: string,
): Promise<HistoryEventDto[]> {
  // One statement: the events with their actors and the actors' organisations (every record page reads this).
  const rows = await readRows<{
    id: string;
    occurred_at: Date;
    action: string;
    before_state: string | Record<string, unknown> | null;
    after_state: string | Record<string, unknown> | null;
    user_name: string | null;
    user_org_id: string | null;
    org_name: string | null;
  }>(
    ds,
    `SELECT e.id, e.occurred_at, e.action, e.before_state, e.after_state,
            u.name AS user_name, u.organization_id AS user_org_id, o.name AS org_name
       FROM audit_events e
       LEFT JOIN users u ON u.id = e.actor_user_id
       LEFT JOIN organizations o ON o.id = u.organization_id
      WHERE e.entity_type = ? AND e.entity_id = ?
      ORDER BY e.id ASC
      LIMIT 500`,
    [entityType, entityId],
  );
  return rows.map((e) => ({
    id: e.id,
    occurredAt: e.occurred_at.toISOString(),
    action: e.action,
    actor:
      e.user_org_id && e.org_name !== null
        ? { name: e.user_org_id === viewerOrgId ? e.user_name! : e.org_name, organization: e.org_name }
        : null,
    before: jsonOf(e.before_state),
    after: jsonOf(e.after_state),
  }));
}

const jsonOf = (v: string | Record<string, unknown> | null) =>
  typeof v === 'string' ? (JSON.parse(v) as Record<string, unknown>) : v;

/** Only the fields that changed, for an audit row's before and after. */
export function changedFields(before: Record<string, unknown>, after: Record<string, unknown>) {
  const b: Record<string, unknown> = {};
  const a: Record<string, unknown> = {};
  for (const k of Object.keys(after)) {
    if (JSON.stringify(before[k]) !== JSON.stringify(after[k])) {
      b[k] = before[k];
      a[k] = after[k];
    }
  }
  return { before: b, after: a, changed: Object.keys(a).length > 0 };
}
