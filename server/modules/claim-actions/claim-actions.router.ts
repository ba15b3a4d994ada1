import crypto from 'node:crypto';
import { Router, type Request } from 'express';
import { z } from 'zod';
import { isActionName } from '../../../shared/claims/stages';
import { assignClaimSchema, conversationFileSchema } from '../../../shared/claims/workflow';
import type { AppContext } from '../../context';
import { Attachment } from '../../db/entities/attachment.entity';
import { ClaimDocument } from '../../db/entities/claim-document.entity';
import { ClaimMessage } from '../../db/entities/claim-message.entity';
import { Claim } from '../../db/entities/claim.entity';
import { actorFromRequest, recordAudit } from '../../lib/audit';
import { AppError, notFound } from '../../lib/errors';
import { sha256Hex } from '../../lib/pdf/hash';
import type { Storage } from '../../lib/storage';
import { inspectUpload } from '../../lib/uploads/inspect';
import { contentDisposition } from '../../lib/uploads/names';
import { authorize, requireUser } from '../../middleware/auth';
import { parseBody, parseWith } from '../../middleware/validate';
import { createClaimActionsService } from './claim-actions.service';
import { loadWorkflow } from './claim-workflow.presenter';

// The review workflow on one claim, beside the claims module's own routes under /api/claims:
//   POST /:id/actions/:action      a move of the stage machine (body: the action's payload; optional If-Match: version)
//   POST /:id/assign               take a claim, hand it to another reviewer, or give it back
//   GET  /:id/workflow             thread, returns, bench tests, decision, documents, history, actions available
//   GET  /:id/documents/:docId     a generated PDF, the stored bytes
//   POST /:id/conversation/files   a file for the next answer; GET …/files/:fileId to read one

const idParam = z.strictObject({ id: z.uuid({ error: 'Not a valid id.' }) });
const actionParams = z.strictObject({ id: z.uuid({ error: 'Not a valid id.' }), action: z.string().max(40) });
const docParams = z.strictObject({ id: z.uuid({ error: 'Not a valid id.' }), docId: z.uuid({ error: 'Not a valid id.' }) });
const fileParams = z.strictObject({ id: z.uuid({ error: 'Not a valid id.' }), fileId: z.uuid({ error: 'Not a valid id.' }) });

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
    const result = await service.perform(claim, req.user!, action, req.body ?? {}, actorFromRequest(req), version);
    res.json({ claim: { id: result.claim.id, stage: result.claim.stage, version: result.claim.version, waitingOn: result.claim.waitingOn }, workflow: await loadWorkflow(ctx.ds, result.claim, req.user!) });
  });

  r.post('/:id/assign', async (req, res) => {
    const { id } = parseWith(idParam, req.params, 'address');
    const input = parseBody(assignClaimSchema, req);
    const version = expectedVersion(req);
    const claim = await loadReadable(req, id);
    authorize(req, 'review', 'Claim', claim, 'claim');
    const fresh = await service.assign(claim, req.user!, input.assigneeId, actorFromRequest(req), version);
    res.json({ claim: { id: fresh.id, stage: fresh.stage, version: fresh.version, assigneeId: fresh.assignedReviewerId } });
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
      throw new AppError(500, 'document.corrupted', 'The stored copy of this document does not match its record.');
    }
    res.setHeader('Content-Type', 'application/pdf');
    res.setHeader('Content-Disposition', contentDisposition(doc.filename));
    res.setHeader('X-Content-Type-Options', 'nosniff');
    res.setHeader('Content-Length', String(bytes.length));
    res.setHeader('X-Content-SHA256', doc.sha256);
    res.setHeader('Repr-Digest', `sha-256=:${Buffer.from(doc.sha256, 'hex').toString('base64')}:`);
    res.end(bytes);
  });

  r.post('/:id/conversation/files', async (req, res) => {
    const { id } = parseWith(idParam, req.params, 'address');
    const input = parseBody(conversationFileSchema, req);
    const claim = await loadReadable(req, id);
    // Files travel with an answer: whoever may answer the open question may upload for it.
    authorize(req, 'update', 'Claim', claim, 'claim');
    const inspected = await inspectUpload(Buffer.from(input.dataBase64, 'base64'), input.name);
    const fileId = crypto.randomUUID();
    const storageKey = `claims/${claim.id}/conversation/${fileId}`;
    await ctx.storage.put(storageKey, inspected.body, inspected.contentType);
    const user = req.user!;
    await ctx.ds.transaction(async (m) => {
      await m.insert(Attachment, {
        id: fileId,
        // Held against the claim until an answer takes it (then owner_type becomes claim_message).
        ownerType: 'claim_message_draft',
        ownerId: claim.id,
        organizationId: user.organizationId,
        uploadedById: user.id,
        kind: inspected.kind,
        purpose: input.purpose,
        contentType: inspected.contentType,
        byteSize: inspected.body.length,
        sha256: inspected.sha256,
        storageKey,
        thumbnailKey: null,
        originalName: inspected.displayName,
        width: inspected.width,
        height: inspected.height,
        capturedAt: inspected.capturedAt,
      });
      await recordAudit(m, actorFromRequest(req), {
        action: 'claim.conversation_file_uploaded',
        entityType: 'Claim',
        entityId: claim.id,
        after: { fileId, name: inspected.displayName, contentType: inspected.contentType, sha256: inspected.sha256 },
      });
    });
    res.status(201).json({
      file: { id: fileId, name: inspected.displayName, contentType: inspected.contentType, kind: inspected.kind, byteSize: inspected.body.length },
    });
  });

  r.get('/:id/conversation/files/:fileId', async (req, res) => {
    const { id, fileId } = parseWith(fileParams, req.params, 'address');
    const claim = await loadReadable(req, id);
    const file = await ctx.ds.getRepository(Attachment).findOneBy({ id: fileId });
    let belongs = false;
    if (file?.ownerType === 'claim_message' && file.ownerId) {
      belongs = await ctx.ds.getRepository(ClaimMessage).exists({ where: { id: file.ownerId, claimId: claim.id } });
    } else if (file?.ownerType === 'claim_message_draft') {
      // An upload not yet sent is its uploader's organisation's alone.
      belongs = file.ownerId === claim.id && file.organizationId === req.user!.organizationId;
    }
    if (!file || !belongs) throw notFound('file');
    const bytes = await ctx.storage.getBuffer(file.storageKey);
    res.setHeader('Content-Type', file.contentType);
    res.setHeader('Content-Disposition', contentDisposition(file.originalName, file.kind === 'photo' ? 'inline' : 'attachment'));
    res.setHeader('X-Content-Type-Options', 'nosniff');
    res.setHeader('Content-Length', String(bytes.length));
    res.end(bytes);
  });

  return r;
}
