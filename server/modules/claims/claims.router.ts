import { subject } from '@casl/ability';
import { Router, type Request } from 'express';
import { z } from 'zod';
import {
  claimListQuerySchema,
  createClaimSchema,
  fileClaimSchema,
  updateClaimSchema,
  batchRequestSchema,
} from '../../../shared/schemas/claims';
import { importQuerySchema } from '../../../shared/schemas/catalogue';
import type { AppContext } from '../../context';
import { actorFromRequest } from '../../lib/audit';
import { templateCsv } from '../../lib/csv-import';
import { AppError } from '../../lib/errors';
import { REPLAY_HEADER } from '../../lib/idempotency';
import { pageOf } from '../../lib/pagination';
import { authorize, authorizeNew, authorizeType, requireUser } from '../../middleware/auth';
import { idempotencyKeyOf, parseBody, parseQuery, parseWith } from '../../middleware/validate';
import { attachmentsRouter } from '../attachments/attachments.router';
import { CLAIM_BATCH_COLUMNS, createClaimBatchesService } from './claim-batches.service';
import { presentBatchPage, presentClaimListItem, presentClaimPage } from './claims.presenter';
import { scopeOf, type LoadedClaim } from './claims-reads.service';
import { createClaimsService, type ClaimsService } from './claims.service';

const asClaim = (c: LoadedClaim) =>
  subject('Claim', {
    contractorId: c.contractorId,
    manufacturerId: c.manufacturerId,
    stage: c.stage,
  } as Record<string, unknown>);

const idParam = z.strictObject({ id: z.uuid({ error: 'Not a valid id.' }) });

export function claimsRouter(ctx: AppContext, opts: { service?: ClaimsService } = {}) {
  const r = Router();
  const service = opts.service ?? createClaimsService(ctx.ds, { publicUrl: ctx.publicUrl });
  r.use(requireUser);

  const batches = createClaimBatchesService(ctx.ds, service);

  /** The claim's page as it is now, after a change the request was authorised for. */
  const claimPageNow = async (req: Request, id: string) =>
    presentClaimPage((await service.findForPage(id))!, req.user!.organizationId);

  const load = async (req: Request, action: 'read' | 'update' | 'file' | 'delete') => {
    const { id } = parseWith(idParam, req.params, 'address');
    const claim = await service.findById(id);
    authorize(req, action, 'Claim', claim, 'claim');
    return claim;
  };

  // Batches first: "/batches" is not a claim id.
  r.get('/batches/template.csv', (req, res) => {
    authorizeType(req, 'create', 'Claim');
    res.type('text/csv').attachment('lumenproof-claims-template.csv').send(templateCsv(CLAIM_BATCH_COLUMNS));
  });

  r.post('/batches', async (req, res) => {
    const { dryRun } = parseQuery(importQuerySchema, req);
    const input = parseBody(batchRequestSchema, req);
    authorizeNew(req, 'create', 'Claim', { contractorId: req.user!.organizationId });
    const { filename, ...rest } = input;
    const result = await batches.importRows(req.user!, rest, dryRun, actorFromRequest(req), filename ?? null);
    res.status(dryRun || result.created === 0 ? 200 : 201).json(result);
  });

  r.get('/batches/:id', async (req, res) => {
    const { id } = parseWith(idParam, req.params, 'address');
    res.json(presentBatchPage(await batches.batchPage(req.user!, req.ability!, id)));
  });

  r.post('/batches/:id/file', async (req, res) => {
    const { id } = parseWith(idParam, req.params, 'address');
    parseBody(fileClaimSchema.pick({}), req);
    const batch = await batches.findBatch(req.user!, id);
    authorizeNew(req, 'file', 'Claim', { contractorId: batch.contractorId });
    res.json(await batches.fileBatch(req.user!, batch.id, actorFromRequest(req)));
  });

  r.get('/', async (req, res) => {
    authorizeType(req, 'read', 'Claim');
    const q = parseQuery(claimListQuerySchema, req);
    const { items, total } = await service.list(scopeOf(req.user!), req.ability!, q);
    res.json(pageOf(items.map(presentClaimListItem), total, q));
  });

  // Idempotency-Key (optional, the client sends one per form start): the same key answers the same draft, as
  // it is now, with Idempotent-Replayed: true; another body under the key is a 422 and writes nothing.
  r.post('/', async (req, res) => {
    const key = idempotencyKeyOf(req);
    const input = parseBody(createClaimSchema, req);
    const { installationId, ...fields } = input;
    const inst = await service.findInstallation(installationId);
    authorize(req, 'read', 'Installation', inst, 'installation');
    authorize(
      req,
      'create',
      'Claim',
      { contractorId: inst.contractorId, manufacturerId: inst.manufacturerId },
      'claim',
    );
    const actor = actorFromRequest(req);
    const made = key
      ? await service.createOnce(inst, fields, actor, { key, userId: req.user!.id, body: input })
      : { id: await service.create(inst, fields, actor), status: 201, replayed: false };
    const page = await service.findForPage(made.id);
    // The draft was deleted since: the key's answer no longer exists.
    if (!page)
      throw new AppError(
        404,
        'not_found',
        'The draft started with this Idempotency-Key has since been deleted.',
      );
    if (made.replayed) res.setHeader(REPLAY_HEADER, 'true');
    res.status(made.status).json({ claim: presentClaimPage(page, req.user!.organizationId) });
  });

  // Photos and documents: readable by whoever may read the claim (anyone else gets 404); added while a draft or
  // while the manufacturer waits on the installer; removed only before filing.
  r.use(
    '/:id/attachments',
    attachmentsRouter<LoadedClaim>(ctx, {
      ownerType: 'claim',
      ownerLabel: 'claim',
      loadOwner: (_req, id) => service.findById(id),
      canRead: (req, c) => req.ability.can('read', asClaim(c)),
      canWrite: (req, c) =>
        req.ability.can('update', asClaim(c)) &&
        (c.stage === 'draft' || (req.method === 'POST' && c.stage === 'needs_info')),
    }),
  );

  // The claim's page: the claim, its history and its files in one statement, authorised on the claim before any of
  // it is shown.
  r.get('/:id', async (req, res) => {
    const { id } = parseWith(idParam, req.params, 'address');
    const page = await service.findForPage(id);
    authorize(req, 'read', 'Claim', page?.claim, 'claim');
    res.json({ claim: presentClaimPage(page!, req.user!.organizationId) });
  });

  r.patch('/:id', async (req, res) => {
    const input = parseBody(updateClaimSchema, req);
    const claim = await load(req, 'update');
    await service.update(claim, input, actorFromRequest(req));
    res.json({ claim: await claimPageNow(req, claim.id) });
  });

  // Idempotency-Key (optional): kept with the answer; the same key replays it, another body under it is a 422.
  r.post('/:id/file', async (req, res) => {
    const key = idempotencyKeyOf(req);
    const input = parseBody(fileClaimSchema, req);
    const claim = await load(req, 'file');
    const result = await service.file(
      claim.id,
      req.user!,
      actorFromRequest(req),
      input,
      key ? { key } : undefined,
    );
    if (result.replayed) res.setHeader(REPLAY_HEADER, 'true');
    res.status(200).json({
      claim: await claimPageNow(req, claim.id),
      replayed: result.replayed,
    });
  });

  r.delete('/:id', async (req, res) => {
    const claim = await load(req, 'delete');
    await service.remove(claim, actorFromRequest(req));
    res.status(204).end();
  });

  return r;
}
