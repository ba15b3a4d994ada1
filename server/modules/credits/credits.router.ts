import { Router } from 'express';
import { z } from 'zod';
import {
  creditExportQuerySchema,
  creditListQuerySchema,
  creditQueueQuerySchema,
  issueCreditSchema,
  voidCreditSchema,
  warrantyCostQuerySchema,
} from '../../../shared/schemas/credits';
import type { AppContext } from '../../context';
import { Claim } from '../../db/entities/claim.entity';
import { actorFromRequest, auditRefusal } from '../../lib/audit';
import { REPLAY_HEADER } from '../../lib/idempotency';
import { pageOf } from '../../lib/pagination';
import { createStorage, type Storage } from '../../lib/storage';
import { authorize, authorizeType, requireUser, toAbilityUser } from '../../middleware/auth';
import { idempotencyKeyOf, parseBody, parseQuery, parseWith } from '../../middleware/validate';
import { presentMemo } from './credits.presenter';
import { createCreditsReports } from './credits.reports';
import { createCreditsService } from './credits.service';

const idParam = z.strictObject({ id: z.uuid({ error: 'Not a valid id.' }) });

function services(ctx: AppContext, storage?: Storage) {
  const store = storage ?? createStorage(ctx.config);
  return {
    storage: store,
    service: createCreditsService(ctx.ds, store, ctx.publicUrl),
    reports: createCreditsReports(ctx.ds),
  };
}

/** POST /api/claims/:id/credits: mounted on /claims beside the claims router. */
export function claimCreditsRouter(ctx: AppContext, storage?: Storage) {
  const r = Router();
  const { service } = services(ctx, storage);

  r.post('/:id/credits', requireUser, async (req, res) => {
    const { id } = parseWith(idParam, req.params, 'address');
    const key = idempotencyKeyOf(req, { required: true });
    const input = parseBody(issueCreditSchema, req);
    const claim = await ctx.ds.getRepository(Claim).findOne({ where: { id } });
    authorize(req, 'credit', 'Claim', claim, 'claim');
    const actor = actorFromRequest(req);
    const answer = await service
      .issue(claim.id, toAbilityUser(req.user!), actor, input, {
        key,
        path: `/api/claims/${claim.id}/credits`,
        body: input,
      })
      .catch((e) => auditRefusal(ctx.ds, actor, e));
    if (answer.replayed) res.setHeader(REPLAY_HEADER, 'true');
    res.status(answer.status).json(answer.body);
  });

  return r;
}

export function creditsRouter(ctx: AppContext, storage?: Storage) {
  const r = Router();
  const { service, reports, storage: store } = services(ctx, storage);
  r.use(requireUser);

  r.get('/', async (req, res) => {
    authorizeType(req, 'read', 'CreditMemo');
    const q = parseQuery(creditListQuerySchema, req);
    const { items, total } = await reports.list(req.ability, toAbilityUser(req.user!), q);
    res.json(pageOf(items, total, q));
  });

  r.get('/queue', async (req, res) => {
    authorizeType(req, 'credit', 'Claim');
    const q = parseQuery(creditQueueQuerySchema, req);
    const { items, total, totals } = await reports.queue(req.ability, toAbilityUser(req.user!), q);
    res.json({ ...pageOf(items, total, q), totals });
  });

  r.get('/balances', async (req, res) => {
    authorizeType(req, 'read', 'CreditMemo');
    parseQuery(z.strictObject({}), req);
    res.json({ items: await reports.balances(req.ability) });
  });

  r.get('/export', async (req, res) => {
    authorizeType(req, 'export', 'CreditMemo');
    const q = parseQuery(creditExportQuerySchema, req);
    const data = await reports.exportRows(req.user!.organizationId, q);
    res
      .type('text/csv; charset=utf-8')
      .attachment(`lumenproof-credits-${q.from}-to-${q.to}.csv`)
      .send(reports.toCsv(data));
  });

  r.get('/cost', async (req, res) => {
    authorizeType(req, 'export', 'CreditMemo');
    const q = parseQuery(warrantyCostQuerySchema, req);
    res.json(await reports.warrantyCost(req.user!.organizationId, q));
  });

  r.get('/:id', async (req, res) => {
    const { id } = parseWith(idParam, req.params, 'address');
    const memo = await reports.findMemo(id);
    authorize(req, 'read', 'CreditMemo', memo, 'credit memo');
    res.json({ creditMemo: presentMemo(memo, req.user!.organizationId) });
  });

  r.get('/:id/pdf', async (req, res) => {
    const { id } = parseWith(idParam, req.params, 'address');
    const memo = await reports.findMemo(id);
    authorize(req, 'read', 'CreditMemo', memo, 'credit memo');
    const pdf = await store.getBuffer(memo.pdfStorageKey);
    res
      .type('application/pdf')
      .setHeader('Content-Disposition', `attachment; filename="${memo.number}.pdf"`)
      .setHeader('X-Content-SHA256', memo.pdfSha256)
      .send(pdf);
  });

  r.post('/:id/void', async (req, res) => {
    const { id } = parseWith(idParam, req.params, 'address');
    const input = parseBody(voidCreditSchema, req);
    const memo = await reports.findMemo(id);
    authorize(req, 'create', 'CreditMemo', memo, 'credit memo');
    const reversal = await service.voidMemo(
      memo.id,
      toAbilityUser(req.user!),
      actorFromRequest(req),
      input.reason,
    );
    res.status(201).json({ creditMemo: reversal });
  });

  return r;
}
