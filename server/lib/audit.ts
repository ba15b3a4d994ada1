import type { EntityManager } from 'typeorm';
import { AuditEvent } from '../db/entities/audit-event.entity';
import { insertMany } from '../db/insert-many';
import { clock } from './clock';
import { AuditedRefusal } from './errors';

export type Actor = { userId: string | null; organizationId: string | null; requestId?: string | null };

/** Writes one audit row with the caller's transaction manager, so it commits or rolls back with the change. */
export async function recordAudit(
  manager: EntityManager,
  actor: Actor,
  event: {
    action: string;
    entityType: string;
    entityId: string;
    organizationId?: string | null;
    before?: Record<string, unknown> | null;
    after?: Record<string, unknown> | null;
  },
) {
  await manager.insert(AuditEvent, {
    occurredAt: clock.now(),
    actorUserId: actor.userId,
    organizationId: event.organizationId ?? actor.organizationId,
    action: event.action,
    entityType: event.entityType,
    entityId: event.entityId,
    before: (event.before ?? null) as never,
    after: (event.after ?? null) as never,
    requestId: actor.requestId ?? null,
  });
}

export function actorFromRequest(req: {
  user?: { id: string; organizationId: string };
  id?: unknown;
}): Actor {
  return {
    userId: req.user?.id ?? null,
    organizationId: req.user?.organizationId ?? null,
    requestId: req.id ? String(req.id) : null,
  };
}

/** Many audit rows in a few multi-row INSERTs (a spreadsheet import), in the caller's transaction. */
export async function recordAuditMany(
  manager: EntityManager,
  actor: Actor,
  events: { action: string; entityType: string; entityId: string; after?: Record<string, unknown> | null }[],
  chunk = 1000,
) {
  const at = clock.now();
  await insertMany(
    manager,
    AuditEvent,
    events.map((e) => ({
      occurredAt: at,
      actorUserId: actor.userId,
      organizationId: actor.organizationId,
      action: e.action,
      entityType: e.entityType,
      entityId: e.entityId,
      before: null,
      after: e.after ?? null,
      requestId: actor.requestId ?? null,
    })),
    chunk,
  );
}

/** Records an AuditedRefusal in a transaction of its own (the refused change has rolled back), then rethrows it. */
export async function auditRefusal(
  ds: { transaction<T>(fn: (m: EntityManager) => Promise<T>): Promise<T> },
  actor: Actor,
  err: unknown,
): Promise<never> {
  if (err instanceof AuditedRefusal) {
    await ds.transaction((m) =>
      recordAudit(m, actor, { ...err.audit, after: { reason: err.code, ...(err.audit.after ?? {}) } }),
    );
  }
  throw err;
}
