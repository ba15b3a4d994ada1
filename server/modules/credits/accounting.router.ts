import { Router } from 'express';
import { accountingMapSchema, journalQuerySchema } from '../../../shared/schemas/credits';
import type { AppContext } from '../../context';
import { actorFromRequest } from '../../lib/audit';
import { authorize, authorizeNew, authorizeType, requireUser } from '../../middleware/auth';
import { parseBody, parseQuery } from '../../middleware/validate';
import { createAccountingService, presentAccountingMap } from './accounting.service';

/** The accounting map and the journal export, under /api/credits (mounted before the memo routes' /:id). */
export function accountingRouter(ctx: AppContext) {
  const r = Router();
  const service = createAccountingService(ctx.ds);

  r.get('/accounting-map', requireUser, async (req, res) => {
    authorizeType(req, 'read', 'AccountingMap');
    const row = await service.getMap(req.user!.organizationId);
    if (row) authorize(req, 'read', 'AccountingMap', row, 'accounting map');
    res.json({ accountingMap: presentAccountingMap(row) });
  });

  r.put('/accounting-map', requireUser, async (req, res) => {
    const input = parseBody(accountingMapSchema, req);
    authorizeNew(req, 'update', 'AccountingMap', { organizationId: req.user!.organizationId });
    const row = await service.putMap(req.user!.organizationId, actorFromRequest(req), input);
    res.json({ accountingMap: presentAccountingMap(row) });
  });

  r.get('/journal', requireUser, async (req, res) => {
    authorizeType(req, 'export', 'CreditMemo');
    const q = parseQuery(journalQuerySchema, req);
    const out = await service.journal(req.user!.organizationId, actorFromRequest(req), q);
    if (out.kind === 'json') return void res.json(out.body);
    res.type(out.type).attachment(out.filename).send(out.body);
  });

  return r;
}
