import type { HistoryEventDto } from '../../shared/schemas/catalogue';
import type { AppDataSource } from '../db/data-source';
import type { AuditEvent } from '../db/entities/audit-event.entity';
import { readRows } from '../db/read';

/** How many events a record's history shows at most (the oldest first). */
export const HISTORY_LIMIT = 500;

/** One event as the viewer sees it: people are named to their own organisation, others see the organisation. */
export function historyEventOf(
  e: Pick<AuditEvent, 'id' | 'occurredAt' | 'action' | 'before' | 'after'>,
  actor: { userName: string | null; userOrgId: string | null; orgName: string | null },
  viewerOrgId: string,
): HistoryEventDto {
  return {
    id: e.id,
    occurredAt: e.occurredAt.toISOString(),
    action: e.action,
    actor:
      actor.userOrgId && actor.orgName !== null
        ? {
            name: actor.userOrgId === viewerOrgId ? actor.userName! : actor.orgName,
            organization: actor.orgName,
          }
        : null,
    before: e.before,
    after: e.after,
  };
}

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
      LIMIT ${HISTORY_LIMIT}`,
    [entityType, entityId],
    // A record's page reads the record from the primary; its history comes from the same place.
    { from: 'primary' },
  );
  return rows.map((e) =>
    historyEventOf(
      {
        id: e.id,
        occurredAt: e.occurred_at,
        action: e.action,
        before: jsonOf(e.before_state),
        after: jsonOf(e.after_state),
      },
      { userName: e.user_name, userOrgId: e.user_org_id, orgName: e.org_name },
      viewerOrgId,
    ),
  );
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
