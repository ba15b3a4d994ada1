import { Router } from 'express';
import {
  SECURITY_EVENT_ACTIONS,
  securityEventsQuerySchema,
  type SecurityEventAction,
  type SecurityEventDto,
} from '../../../shared/schemas/security';
import type { AppContext } from '../../context';
import { Conditions, isoOfDateTime, readRows } from '../../db/read';
import { pageOf } from '../../lib/pagination';
import { authorizeType, requireUser } from '../../middleware/auth';
import { parseQuery } from '../../middleware/validate';

type Row = {
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

function ipOf(after: string | Record<string, unknown> | null): string | null {
  if (!after) return null;
  try {
    const v = (typeof after === 'string' ? (JSON.parse(after) as { ip?: unknown }) : after).ip;
    return typeof v === 'string' ? v : null;
  } catch {
    return null;
  }
}

/** GET /api/security-events: the organisation's security-relevant audit entries, for its administrators. */
export function securityEventsRouter(ctx: AppContext) {
  const r = Router();
  r.use(requireUser);

  r.get('/', async (req, res) => {
    const q = parseQuery(securityEventsQuerySchema, req);
    authorizeType(req, 'read', 'AuditEvent');
    const where = new Conditions().and('a.organization_id = ?', req.user!.organizationId);
    if (!q.action) where.and(`(a.action IN (?) OR ${ROLES_CHANGED})`, DIRECT_ACTIONS);
    else if (q.action === 'user.roles_changed')
      where.and(`(a.action = 'user.roles_changed' OR ${ROLES_CHANGED})`);
    else where.and('a.action = ?', q.action);
    if (q.userId) where.and("(a.entity_type = 'User' AND a.entity_id = ?)", q.userId);

    const [rows, [{ total }]] = await Promise.all([
      readRows<Row>(
        ctx.ds,
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
        ctx.ds,
        `SELECT COUNT(*) AS total FROM audit_events a ${where.sql}`,
        where.params,
      ),
    ]);

    const items: SecurityEventDto[] = rows.map((row) => {
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
    });
    res.json(pageOf(items, Number(total), q));
  });

  return r;
}
