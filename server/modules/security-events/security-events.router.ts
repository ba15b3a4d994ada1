import { Router } from 'express';
import { securityEventsQuerySchema } from '../../../shared/schemas/security';
import type { AppContext } from '../../context';
import { pageOf } from '../../lib/pagination';
import { authorizeType, requireUser } from '../../middleware/auth';
import { parseQuery } from '../../middleware/validate';
import { presentSecurityEvent } from './security-events.presenter';
import { createSecurityEventsService } from './security-events.service';

/** GET /api/security-events: the organisation's security-relevant audit entries, for its administrators. */
export function securityEventsRouter(ctx: AppContext) {
  const r = Router();
  const service = createSecurityEventsService(ctx.ds);
  r.use(requireUser);

  r.get('/', async (req, res) => {
    const q = parseQuery(securityEventsQuerySchema, req);
    authorizeType(req, 'read', 'AuditEvent');
    const { rows, total } = await service.list(req.ability, q);
    res.json(pageOf(rows.map(presentSecurityEvent), total, q));
  });

  return r;
}
