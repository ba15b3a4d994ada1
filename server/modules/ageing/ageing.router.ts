import { Router } from 'express';
import { updateStageTargetsSchema } from '../../../shared/schemas/ageing';
import type { AppContext } from '../../context';
import { actorFromRequest } from '../../lib/audit';
import { clock } from '../../lib/clock';
import { authorizeType, requireUser } from '../../middleware/auth';
import { parseBody } from '../../middleware/validate';
import { ageingCsv, createAgeingService } from './ageing.service';

/** Ageing of the manufacturer's open claims, for its administrators; always scoped to their organisation. */
export function ageingRouter(ctx: AppContext) {
  const r = Router();
  const service = createAgeingService(ctx.ds);
  r.use(requireUser);

  r.get('/', async (req, res) => {
    authorizeType(req, 'read', 'Ageing');
    res.json(await service.view(req.user!.organizationId));
  });

  r.get('/export', async (req, res) => {
    authorizeType(req, 'read', 'Ageing');
    const csv = ageingCsv(await service.view(req.user!.organizationId));
    res
      .type('text/csv; charset=utf-8')
      .attachment(`ageing-${clock.now().toISOString().slice(0, 10)}.csv`)
      .send(csv);
  });

  r.put('/targets', async (req, res) => {
    const input = parseBody(updateStageTargetsSchema, req);
    authorizeType(req, 'update', 'Ageing');
    await service.setTargets(req.user!.organizationId, input.targets, actorFromRequest(req));
    res.json(await service.view(req.user!.organizationId));
  });

  return r;
}
