import { SECURITY_EVENT_ACTIONS, type SecurityEventsQuery } from '../../../shared/schemas/security';
import type { AppAbility } from '../../../shared/abilities';
import type { AppDataSource } from '../../db/data-source';
import { Conditions, readRows } from '../../db/read';
import { scopeConditions } from '../../lib/tenant-scope';

/** One audit entry as read: what security-events.presenter.ts turns into a SecurityEventDto. */
export type SecurityEventRow = {
  id: string;
  occurred_at: string;
  action: string;
  entity_type: string;
  entity_id: string;
  actor_user_id: string | null;
  after_state: string | Record<string, unknown> | null;
  s_name: string | null;
  s_email: string | null;
  a_name: string | null;
};

// A change of roles is written as user.updated with the roles before and after; it is a security event when they
// differ. Other branches may write user.roles_changed itself: both count.
const ROLES_CHANGED = `(a.action = 'user.updated' AND JSON_EXTRACT(a.before_state, '$.roles') <> JSON_EXTRACT(a.after_state, '$.roles'))`;
const DIRECT_ACTIONS = SECURITY_EVENT_ACTIONS.filter((a) => a !== 'user.roles_changed');

export function createSecurityEventsService(ds: AppDataSource) {
  return {
    /** The organisation's security-relevant audit entries (the rules scope them), newest first, and the total. */
    async list(ability: AppAbility, q: SecurityEventsQuery) {
      const scope = scopeConditions(ability, 'AuditEvent', 'a');
      const where = new Conditions().and(scope.sql, ...scope.params);
      if (!q.action) where.and(`(a.action IN (?) OR ${ROLES_CHANGED})`, DIRECT_ACTIONS);
      else if (q.action === 'user.roles_changed')
        where.and(`(a.action = 'user.roles_changed' OR ${ROLES_CHANGED})`);
      else where.and('a.action = ?', q.action);
      if (q.userId) where.and("(a.entity_type = 'User' AND a.entity_id = ?)", q.userId);
      const [rows, [{ total }]] = await Promise.all([
        readRows<SecurityEventRow>(
          ds,
          `SELECT a.id, a.occurred_at, a.action, a.entity_type, a.entity_id, a.actor_user_id, a.after_state,
                  s.name AS s_name, s.email AS s_email, ac.name AS a_name
             FROM audit_events a
             LEFT JOIN users s ON a.entity_type = 'User' AND s.id = a.entity_id AND s.organization_id = a.organization_id
             LEFT JOIN users ac ON ac.id = a.actor_user_id AND ac.organization_id = a.organization_id
             ${where.sql}
            ORDER BY a.occurred_at DESC, a.id DESC
            LIMIT ? OFFSET ?`,
          [...where.params, q.pageSize, (q.page - 1) * q.pageSize],
          { dateStrings: true },
        ),
        readRows<{ total: number }>(
          ds,
          `SELECT COUNT(*) AS total FROM audit_events a ${where.sql}`,
          where.params,
        ),
      ]);
      return { rows, total: Number(total) };
    },
  };
}
