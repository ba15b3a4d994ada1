import { pipeline } from 'node:stream/promises';
import { subject } from '@casl/ability';
import { Router, type Request } from 'express';
import { z } from 'zod';
import { isActionName } from '../../../shared/claims/stages';
import { assignClaimSchema, CONVERSATION_DRAFT, CONVERSATION_SENT } from '../../../shared/claims/workflow';
import type { AppContext } from '../../context';
import { ClaimDocument } from '../../db/entities/claim-document.entity';
import { ClaimMessage } from '../../db/entities/claim-message.entity';
import { Claim } from '../../db/entities/claim.entity';
import { actorFromRequest } from '../../lib/audit';
import { AppError, notFound } from '../../lib/errors';
import { sha256Hex } from '../../lib/pdf/hash';
import type { Storage } from '../../lib/storage';
import { contentDisposition } from '../../lib/uploads/names';
import { authorize, requireUser } from '../../middleware/auth';
import { parseBody, parseWith } from '../../middleware/validate';
import { attachmentsRouter } from '../attachments/attachments.router';
import { openAttachment } from '../attachments/attachments.service';
import { createClaimActionsService } from './claim-actions.service';
import { loadWorkflow } from './claim-workflow.presenter';

// The review workflow on one claim, beside the claims module's own routes under /api/claims:
//   POST /:id/actions/:action      a move of the stage machine (body: the action's payload; optional If-Match: version)
//   POST /:id/assign               take a claim, hand it to another reviewer, or give it back
//   GET  /:id/workflow             thread, returns, bench tests, decision, documents, history, actions available
//   GET  /:id/documents/:docId     a generated PDF, the stored bytes
//   /:id/conversation/uploads      the next answer's files, multipart (the attachments module's routes)
//   GET  /:id/conversation/files/:fileId[/thumbnail]   a file sent with an answer

const idParam = z.strictObject({ id: z.uuid({ error: 'Not a valid id.' }) });
const actionParams = z.strictObject({ id: z.uuid({ error: 'Not a valid id.' }), action: z.string().max(40) });
const docParams = z.strictObject({
  id: z.uuid({ error: 'Not a valid id.' }),
  docId: z.uuid({ error: 'Not a valid id.' }),
});
const fileParams = z.strictObject({
  id: z.uuid({ error: 'Not a valid id.' }),
  fileId: z.uuid({ error: 'Not a valid id.' }),
});

const asClaim = (c: Claim) =>
  subject('Claim', {
    contractorId: c.contractorId,
    manufacturerId: c.manufacturerId,
    stage: c.stage,
  } as Record<string, unknown>);

/** `If-Match: "7"` or `7`: the claim's version the user last saw. */
function expectedVersion(req: Request): number | undefined {
  const raw = req.get('if-match');
  if (raw === undefined) return undefined;
  const m = /^\s*(?:W\/)?"?(\d{1,9})"?\s*$/.exec(raw);
  if (!m) throw new AppError(400, 'validation.failed', 'If-Match must carry the claim version, like "7".');
  return Number(m[1]);
}

export function claimActionsRouter(ctx: AppContext & { storage: Storage }) {
  const r = Router();
  const service = createClaimActionsService(ctx);
  const claims = ctx.ds.getRepository(Claim);
  r.use(requireUser);

  const loadReadable = async (req: Request, id: string) => {
    const claim = await claims.findOneBy({ id });
    authorize(req, 'read', 'Claim', claim, 'claim');
    return claim as Claim;
  };

  r.post('/:id/actions/:action', async (req, res) => {
    const { id, action } = parseWith(actionParams, req.params, 'address');
    if (!isActionName(action)) {
      throw new AppError(400, 'claim.unknown_action', `There is no claim action called "${action}".`);
    }
    const version = expectedVersion(req);
    const claim = await loadReadable(req, id);
    const result = await service.perform(
      claim,
      req.user!,
      action,
      req.body ?? {},
      actorFromRequest(req),
      version,
    );
    res.json({
      claim: {
        id: result.claim.id,
        stage: result.claim.stage,
        version: result.claim.version,
        waitingOn: result.claim.waitingOn,
      },
      workflow: await loadWorkflow(ctx.ds, result.claim, req.user!),
    });
  });

  r.post('/:id/assign', async (req, res) => {
    const { id } = parseWith(idParam, req.params, 'address');
    const input = parseBody(assignClaimSchema, req);
    const version = expectedVersion(req);
    const claim = await loadReadable(req, id);
    authorize(req, 'review', 'Claim', claim, 'claim');
    const fresh = await service.assign(claim, req.user!, input.assigneeId, actorFromRequest(req), version);
    res.json({
      claim: {
        id: fresh.id,
        stage: fresh.stage,
        version: fresh.version,
        assigneeId: fresh.assignedReviewerId,
      },
    });
  });

  r.get('/:id/workflow', async (req, res) => {
    const { id } = parseWith(idParam, req.params, 'address');
    const claim = await loadReadable(req, id);
    res.json(await loadWorkflow(ctx.ds, claim, req.user!));
  });

  r.get('/:id/documents/:docId', async (req, res) => {
    const { id, docId } = parseWith(docParams, req.params, 'address');
    const claim = await loadReadable(req, id);
    const doc = await ctx.ds.getRepository(ClaimDocument).findOneBy({ id: docId, claimId: claim.id });
    if (!doc) throw notFound('document');
    const bytes = await ctx.storage.getBuffer(doc.storageKey);
    // The stored hash is the record: a copy that no longer matches is refused rather than served.
    if (sha256Hex(bytes) !== doc.sha256) {
      ctx.logger.error({ docId: doc.id }, 'stored document does not match its hash');
      throw new AppError(
        500,
        'document.corrupted',
        'The stored copy of this document does not match its record.',
      );
    }
    res.setHeader('Content-Type', 'application/pdf');
    res.setHeader('Content-Disposition', contentDisposition(doc.filename));
    res.setHeader('X-Content-Type-Options', 'nosniff');
    res.setHeader('Content-Length', String(bytes.length));
    res.setHeader('X-Content-SHA256', doc.sha256);
    res.setHeader('Repr-Digest', `sha-256=:${Buffer.from(doc.sha256, 'hex').toString('base64')}:`);
    res.end(bytes);
  });

  // Files for the next answer: the attachments module's multipart routes (magic bytes, re-encoding, size and
  // count limits, hostile files refused, nothing kept of a refusal), held against the claim until an answer takes
  // them. Unsent files are the contractor's alone: whoever may not change the claim sees no such collection (404).
  r.use(
    '/:id/conversation/uploads',
    attachmentsRouter<Claim>(ctx, {
      ownerType: CONVERSATION_DRAFT,
      ownerLabel: 'claim',
      loadOwner: (_req, id) => claims.findOneBy({ id }),
      canRead: (req, c) => req.ability.can('read', asClaim(c)) && req.ability.can('update', asClaim(c)),
      // Only while the question is open: the files travel with the answer to it.
      canWrite: (_req, c) => c.stage === 'needs_info',
    }),
  );

  // A file sent with an answer: whoever may read the claim may read it.
  for (const variant of ['original', 'thumbnail'] as const) {
    r.get(
      `/:id/conversation/files/:fileId${variant === 'thumbnail' ? '/thumbnail' : ''}`,
      async (req, res) => {
        const { id, fileId } = parseWith(fileParams, req.params, 'address');
        const claim = await loadReadable(req, id);
        const opened = await openAttachment(ctx, {
          id: fileId,
          ownerType: CONVERSATION_SENT,
          variant,
          canSee: async (owner) =>
            !!owner.id &&
            ctx.ds.getRepository(ClaimMessage).exists({ where: { id: owner.id, claimId: claim.id } }),
        });
        res.status(200).set(opened.headers);
        await pipeline(opened.body, res);
      },
    );
  }

  return r;
}
