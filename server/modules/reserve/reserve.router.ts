import { Router } from 'express';
import { reserveQuerySchema } from '../../../shared/schemas/analytics';
import type { AppContext } from '../../context';
import { clock } from '../../lib/clock';
import { authorizeType, requireUser } from '../../middleware/auth';
import { parseQuery } from '../../middleware/validate';
import { reserveCsv, sendCsv } from '../analytics/analytics.presenter';
import { createAnalyticsService } from '../analytics/analytics.service';
import { buildReserve } from './reserve.service';

export function reserveRouter(ctx: AppContext) {
  const r = Router();
  const service = createAnalyticsService(ctx.ds);
  r.use(requireUser);

  // The accountants' forecast, for their own manufacturer only (every query is scoped to it).
  r.get('/', async (req, res) => {
    authorizeType(req, 'read', 'Reserve');
    const q = parseQuery(reserveQuerySchema, req);
    if (q.format === 'csv') authorizeType(req, 'export', 'Reserve');
    const dto = await buildReserve(service, req.user!.organizationId, q.asOf ?? clock.today(), q.months);
    if (q.format === 'csv') return sendCsv(res, reserveCsv(dto, q.table));
    res.json(dto);
  });

  return r;
}
