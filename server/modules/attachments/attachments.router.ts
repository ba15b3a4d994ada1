import { pipeline } from 'node:stream/promises';
import { Router, type Request } from 'express';
import { z } from 'zod';
import { uploadAttachmentSchema } from '../../../shared/schemas/attachments';
import type { AppContext } from '../../context';
import { actorFromRequest } from '../../lib/audit';
import { forbidden, notFound } from '../../lib/errors';
import { requireUser } from '../../middleware/auth';
import { receiveFile } from '../../middleware/upload';
import { parseWith } from '../../middleware/validate';
import { presentAttachment } from './attachments.presenter';
import {
  findAttachment,
  listAttachments,
  openAttachment,
  removeAttachment,
  saveAttachment,
} from './attachments.service';

export type AttachmentOwnerBinding<O extends { id: string }> = {
  /** Stored on each row, e.g. 'claim'. */
  ownerType: string;
  /** Used in "not found" messages, e.g. 'claim'. */
  ownerLabel?: string;
  /** Loads the owner named by the :id in the address, or null. */
  loadOwner: (req: Request, id: string) => Promise<O | null>;
  /** May this user see the owner (and so its files)? No answers 404, like a missing owner. */
  canRead: (req: Request, owner: O) => boolean | Promise<boolean>;
  /** May this user add or remove files? No (for someone who can read) answers 403. */
  canWrite: (req: Request, owner: O) => boolean | Promise<boolean>;
};

const ownerParam = z.object({ id: z.uuid({ error: 'Not a valid id.' }) });
const attachmentParam = z.object({
  id: z.uuid({ error: 'Not a valid id.' }),
  attachmentId: z.uuid({ error: 'Not a valid id.' }),
});

/**
 * The files of one kind of owner, for mounting at `/api/<owners>/:id/attachments`:
 * GET / (list), POST / (multipart, field "file" and optional "purpose"), GET /:attachmentId,
 * GET /:attachmentId/content, GET /:attachmentId/thumbnail, DELETE /:attachmentId.
 * Every route loads the owner and authorises before it reads a byte of the upload or of a stored file.
 */
export function attachmentsRouter<O extends { id: string }>(
  ctx: AppContext,
  binding: AttachmentOwnerBinding<O>,
) {
  const r = Router({ mergeParams: true });
  const label = binding.ownerLabel ?? binding.ownerType;
  r.use(requireUser);

  async function ownerFor(req: Request, action: 'read' | 'write') {
    const { id } = parseWith(ownerParam, req.params, 'address');
    const owner = await binding.loadOwner(req, id);
    if (!owner || !(await binding.canRead(req, owner))) throw notFound(label);
    if (action === 'write' && !(await binding.canWrite(req, owner))) throw forbidden();
    return { type: binding.ownerType, id: owner.id };
  }
  const base = (req: Request) => `${req.baseUrl}`;

  r.get('/', async (req, res) => {
    const owner = await ownerFor(req, 'read');
    const items = await listAttachments(ctx, owner);
    res.json({ items: items.map((a) => presentAttachment(a, base(req), req.user!.organizationId)) });
  });

  r.post('/', async (req, res) => {
    const owner = await ownerFor(req, 'write');
    // The multipart body is read only now, after authorisation; its text fields are validated with it.
    const file = await receiveFile(req, res);
    const input = parseWith(uploadAttachmentSchema, { ...req.body }, 'upload');
    const attachment = await saveAttachment(ctx, {
      owner,
      uploader: { id: req.user!.id, organizationId: req.user!.organizationId },
      purpose: input.purpose,
      file,
      actor: actorFromRequest(req),
    });
    res.status(201).json({ attachment: presentAttachment(attachment, base(req), req.user!.organizationId) });
  });

  r.get('/:attachmentId', async (req, res) => {
    const { attachmentId } = parseWith(attachmentParam, req.params, 'address');
    const owner = await ownerFor(req, 'read');
    const attachment = await findAttachment(ctx, owner, attachmentId);
    if (!attachment) throw notFound('attachment');
    res.json({ attachment: presentAttachment(attachment, base(req), req.user!.organizationId) });
  });

  for (const variant of ['content', 'thumbnail'] as const) {
    r.get(`/:attachmentId/${variant}`, async (req, res) => {
      const { attachmentId } = parseWith(attachmentParam, req.params, 'address');
      const owner = await ownerFor(req, 'read');
      const opened = await openAttachment(ctx, {
        id: attachmentId,
        ownerType: owner.type,
        variant: variant === 'content' ? 'original' : 'thumbnail',
        canSee: (o) => o.id === owner.id,
      });
      res.status(200).set(opened.headers);
      await pipeline(opened.body, res);
    });
  }

  r.delete('/:attachmentId', async (req, res) => {
    const { attachmentId } = parseWith(attachmentParam, req.params, 'address');
    const owner = await ownerFor(req, 'write');
    const attachment = await findAttachment(ctx, owner, attachmentId);
    if (!attachment) throw notFound('attachment');
    await removeAttachment(ctx, attachment, actorFromRequest(req));
    res.status(204).end();
  });

  return r;
}
