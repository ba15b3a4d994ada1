import { In } from 'typeorm';
import type { HistoryEventDto } from '../../shared/schemas/catalogue';
import type { AppDataSource } from '../db/data-source';
import { AuditEvent } from '../db/entities/audit-event.entity';
import { Organization } from '../db/entities/organization.entity';
import { User } from '../db/entities/user.entity';

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
  const events = await ds
    .getRepository(AuditEvent)
    .find({ where: { entityType, entityId }, order: { id: 'ASC' }, take: 500 });
  const userIds = [...new Set(events.map((e) => e.actorUserId).filter((x): x is string => !!x))];
  const users = userIds.length
    ? await ds
        .getRepository(User)
        .find({ where: { id: In(userIds) }, select: { id: true, name: true, organizationId: true } })
    : [];
  const orgIds = [...new Set(users.map((u) => u.organizationId))];
  const orgs = orgIds.length ? await ds.getRepository(Organization).find({ where: { id: In(orgIds) } }) : [];
  const userById = new Map(users.map((u) => [u.id, u]));
  const orgById = new Map(orgs.map((o) => [o.id, o]));
  return events.map((e) => {
    const u = e.actorUserId ? userById.get(e.actorUserId) : undefined;
    const org = u ? orgById.get(u.organizationId) : undefined;
    return {
      id: e.id,
      occurredAt: e.occurredAt.toISOString(),
      action: e.action,
      actor:
        u && org
          ? { name: u.organizationId === viewerOrgId ? u.name : org.name, organization: org.name }
          : null,
      before: e.before,
      after: e.after,
    };
  });
}

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
