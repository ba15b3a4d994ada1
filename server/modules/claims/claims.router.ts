import { Router, type Request } from 'express';
import { z } from 'zod';
import {
  claimListQuerySchema,
  createClaimSchema,
  fileClaimSchema,
  updateClaimSchema,
  type ClaimAttachmentDto,
} from '../../../shared/schemas/claims';
import { withdrawSchema } from '../../../shared/claims/actions.schema';
import type { AppContext } from '../../context';
import { Installation } from '../../db/entities/installation.entity';
import { User } from '../../db/entities/user.entity';
import { actorFromRequest } from '../../lib/audit';
import { loadHistory } from '../../lib/history';
import { pageOf } from '../../lib/pagination';
import { authorize, authorizeType, requireUser } from '../../middleware/auth';
import { parseBody, parseQuery, parseWith } from '../../middleware/validate';
import { presentClaimDetail, presentClaimListItem } from './claims.presenter';
import { createClaimsService, currentFilingIssues, scopeOf, type ClaimsService, type EvidenceCounter, type LoadedClaim } from './claims.service';

const idParam = z.strictObject({ id: z.uuid({ error: 'Not a valid id.' }) });

export type ClaimAttachmentsHook = {
  /** The claim's attachments as the detail shows them. */
  list: (claimId: string) => Promise<ClaimAttachmentDto[]>;
  evidence: EvidenceCounter;
};

export async function claimDetail(ctx: AppContext, req: Request, c: LoadedClaim, attachments?: ClaimAttachmentsHook) {
  const createdBy = c.createdById ? await ctx.ds.getRepository(User).findOne({ where: { id: c.createdById }, select: { id: true, name: true, organizationId: true } }) : null;
  return presentClaimDetail(c, {
    history: await loadHistory(ctx.ds, 'Claim', c.id, req.user!.organizationId),
    attachments: attachments ? await attachments.list(c.id) : [],
    filingIssues: c.stage === 'draft' ? currentFilingIssues(c) : [],
    createdBy: createdBy ? { id: createdBy.id, name: createdBy.organizationId === req.user!.organizationId ? createdBy.name : '' } : null,
  });
}

export function claimsRouter(ctx: AppContext, opts: { attachments?: ClaimAttachmentsHook; service?: ClaimsService } = {}) {
  const r = Router();
  const service = opts.service ?? createClaimsService(ctx.ds, { publicUrl: ctx.publicUrl, evidence: opts.attachments?.evidence });
  r.use(requireUser);

  const load = async (req: Request, action: 'read' | 'update' | 'file' | 'delete') => {
    const { id } = parseWith(idParam, req.params, 'address');
    const claim = await service.findById(id);
    authorize(req, action, 'Claim', claim, 'claim');
    return claim;
  };

  r.get('/', async (req, res) => {
    authorizeType(req, 'read', 'Claim');
    const q = parseQuery(claimListQuerySchema, req);
    const { items, total } = await service.list(scopeOf(req.user!), q);
    res.json(pageOf(items.map(presentClaimListItem), total, q));
  });

  r.post('/', async (req, res) => {
    const { installationId, ...fields } = parseBody(createClaimSchema, req);
    const inst = await ctx.ds.getRepository(Installation).findOne({ where: { id: installationId } });
    authorize(req, 'read', 'Installation', inst, 'installation');
    authorize(req, 'create', 'Claim', { contractorId: inst.contractorId, manufacturerId: inst.manufacturerId }, 'claim');
    const id = await service.create(inst, fields, actorFromRequest(req));
    res.status(201).json({ claim: await claimDetail(ctx, req, (await service.findById(id))!, opts.attachments) });
  });

  r.get('/:id', async (req, res) => {
    const claim = await load(req, 'read');
    res.json({ claim: await claimDetail(ctx, req, claim, opts.attachments) });
  });

  r.patch('/:id', async (req, res) => {
    const input = parseBody(updateClaimSchema, req);
    const claim = await load(req, 'update');
    await service.update(claim, input, actorFromRequest(req));
    res.json({ claim: await claimDetail(ctx, req, (await service.findById(claim.id))!, opts.attachments) });
  });

  r.post('/:id/file', async (req, res) => {
    const input = parseBody(fileClaimSchema, req);
    const claim = await load(req, 'file');
    const result = await service.file(claim.id, req.user!, actorFromRequest(req), input);
    res.status(200).json({ claim: await claimDetail(ctx, req, (await service.findById(claim.id))!, opts.attachments), replayed: result.replayed });
  });

  r.post('/:id/withdraw', async (req, res) => {
    const input = parseBody(withdrawSchema, req);
    // The stage machine's withdraw move asks for the same ability as filing.
    const claim = await load(req, 'file');
    await service.withdraw(claim, input.reason, req.user!, actorFromRequest(req));
    res.json({ claim: await claimDetail(ctx, req, (await service.findById(claim.id))!, opts.attachments) });
  });

  r.delete('/:id', async (req, res) => {
    const claim = await load(req, 'delete');
    await service.remove(claim, actorFromRequest(req));
    res.status(204).end();
  });

  return r;
}
