import crypto from 'node:crypto';
import type { Readable } from 'node:stream';
import { In, IsNull, type EntityManager } from 'typeorm';
import { MAX_ATTACHMENTS_PER_OWNER, type AttachmentPurpose } from '../../../shared/schemas/attachments';
import type { AppContext } from '../../context';
import { Attachment } from '../../db/entities/attachment.entity';
import { hydrate, selectColumns } from '../../db/hydrate';
import { Conditions, readRows } from '../../db/read';
import { recordAudit, type Actor } from '../../lib/audit';
import { clock } from '../../lib/clock';
import { crashPoint } from '../../lib/crash-point';
import { AppError, conflict, notFound } from '../../lib/errors';
import { StorageObjectMissing, type Storage } from '../../lib/storage';
import { inspectUpload, type InspectedUpload } from '../../lib/uploads/inspect';
import { contentDisposition } from '../../lib/uploads/names';

// Attachments for any owner (a claim, or whatever else takes files). These functions never decide who may see
// an owner: the owner's module loads the owner and authorises first, then calls them; openAttachment also
// takes a canSee check for callers that start from an attachment id.

export type AttachmentsContext = Pick<AppContext, 'ds' | 'storage' | 'logger'>;
/** What the files belong to; id is null while a draft is being assembled (the owner does not exist yet). */
export type AttachmentOwner = { type: string; id: string | null };
export type Uploader = { id: string; organizationId: string };
export type IncomingFile = { buffer: Buffer; originalname?: string };

const OWNER_TYPE = /^[a-z][a-z_]{0,31}$/;

export const limitReached = () =>
  conflict(
    'attachment.limit_reached',
    `This already has ${MAX_ATTACHMENTS_PER_OWNER} files, the most it can have. Remove one before adding another.`,
  );

function checkOwner(owner: AttachmentOwner) {
  if (!OWNER_TYPE.test(owner.type)) throw new Error(`Not an owner type: ${owner.type}`);
}

/** Rows of one owner; a draft's files are told apart by who uploaded them. */
function ownerWhere(owner: AttachmentOwner, uploaderId?: string) {
  return owner.id
    ? { ownerType: owner.type, ownerId: owner.id }
    : { ownerType: owner.type, ownerId: IsNull(), uploadedById: uploaderId ?? '' };
}

export function countAttachments(manager: EntityManager, owner: AttachmentOwner, uploaderId?: string) {
  return manager.count(Attachment, { where: ownerWhere(owner, uploaderId) });
}

function auditView(a: Attachment) {
  return {
    ownerType: a.ownerType,
    ownerId: a.ownerId,
    kind: a.kind,
    purpose: a.purpose,
    name: a.originalName,
    contentType: a.contentType,
    byteSize: a.byteSize,
    sha256: a.sha256,
  };
}

/** Where an inspected file's bytes were put: its own random keys, never a name the sender chose. */
export type StoredKeys = { storageKey: string; thumbnailKey: string | null };

/**
 * Puts an inspected file (and its thumbnail) in storage under fresh random keys. A failed put removes what this
 * call had already stored, so it leaves nothing behind or everything.
 */
export async function storeInspected(
  storage: Storage,
  inspected: InspectedUpload,
  onOrphan: OrphanLogger = () => {},
): Promise<StoredKeys> {
  const name = crypto.randomUUID();
  const keys: StoredKeys = {
    storageKey: `attachments/${name}`,
    thumbnailKey: inspected.thumbnail ? `attachments/${name}-thumb` : null,
  };
  const stored: string[] = [];
  try {
    await storage.put(keys.storageKey, inspected.body, inspected.contentType);
    stored.push(keys.storageKey);
    if (keys.thumbnailKey && inspected.thumbnail) {
      await storage.put(keys.thumbnailKey, inspected.thumbnail.body, inspected.thumbnail.contentType);
      stored.push(keys.thumbnailKey);
    }
    return keys;
  } catch (err) {
    await deleteStored(storage, stored, onOrphan);
    throw err;
  }
}

type OrphanLogger = (err: unknown, key: string) => void;

/** Deletes stored objects whose row was never written; a failure is logged, never thrown over the cause. */
export async function deleteStored(storage: Storage, keys: StoredKeys | string[], onOrphan: OrphanLogger) {
  const list = Array.isArray(keys)
    ? keys
    : [keys.storageKey, keys.thumbnailKey].filter((k): k is string => !!k);
  for (const key of list) await storage.delete(key).catch((err) => onOrphan(err, key));
}

/** The row of a stored file, not yet saved: the caller saves it in its own transaction (see saveAttachment). */
export function newAttachmentRow(
  m: EntityManager,
  input: {
    owner: AttachmentOwner;
    uploader: Uploader;
    purpose: AttachmentPurpose;
    inspected: InspectedUpload;
    stored: StoredKeys;
    createdAt?: Date;
  },
): Attachment {
  const { owner, uploader, inspected } = input;
  checkOwner(owner);
  return m.create(Attachment, {
    ownerType: owner.type,
    ownerId: owner.id,
    organizationId: uploader.organizationId,
    uploadedById: uploader.id,
    kind: inspected.kind,
    purpose: input.purpose,
    contentType: inspected.contentType,
    byteSize: inspected.body.length,
    sha256: inspected.sha256,
    storageKey: input.stored.storageKey,
    thumbnailKey: input.stored.thumbnailKey,
    originalName: inspected.displayName,
    width: inspected.width,
    height: inspected.height,
    capturedAt: inspected.capturedAt,
    ...(input.createdAt ? { createdAt: input.createdAt } : {}),
    deletedAt: null,
  });
}

/** The audit event of a saved row. */
export const attachmentAddedEvent = (row: Attachment) => ({
  action: 'attachment.added',
  entityType: 'Attachment',
  entityId: row.id,
  after: auditView(row),
});

/**
 * Takes one uploaded file for an owner: inspects it (refusing what is not an accepted, safe file), stores it and
 * its thumbnail under random keys, and writes the row, all or nothing. A refusal, a full owner or a failed
 * database write leaves no stored object and no row behind.
 */
export async function saveAttachment(
  ctx: AttachmentsContext,
  input: {
    owner: AttachmentOwner;
    uploader: Uploader;
    purpose: AttachmentPurpose;
    file: IncomingFile;
    actor?: Actor;
  },
): Promise<Attachment> {
  const { owner, uploader, purpose, file } = input;
  checkOwner(owner);
  // A cheap early refusal, before any image work; the count that counts is the one under the lock below.
  if ((await countAttachments(ctx.ds.manager, owner, uploader.id)) >= MAX_ATTACHMENTS_PER_OWNER)
    throw limitReached();

  const inspected = await inspectUpload(file.buffer, file.originalname);
  const onOrphan: OrphanLogger = (err, key) =>
    ctx.logger.error({ err, key }, 'could not delete an orphaned upload');
  const stored = await storeInspected(ctx.storage, inspected, onOrphan);
  try {
    await crashPoint('attachment.save.after_store');
    return await withOwnerLock(ctx, owner, uploader.id, async (m) => {
      if ((await countAttachments(m, owner, uploader.id)) >= MAX_ATTACHMENTS_PER_OWNER) throw limitReached();
      const row = newAttachmentRow(m, { owner, uploader, purpose, inspected, stored });
      await m.save(row);
      await crashPoint('attachment.save.after_row', m);
      await recordAudit(
        m,
        input.actor ?? { userId: uploader.id, organizationId: uploader.organizationId },
        attachmentAddedEvent(row),
      );
      await crashPoint('attachment.save.before_commit', m);
      return row;
    });
  } catch (err) {
    await deleteStored(ctx.storage, stored, onOrphan);
    throw err;
  }
}

/**
 * Runs fn in a transaction while holding a named database lock for the owner, so that two uploads at once cannot
 * both pass the count. The lock is released only after the commit, when the new row is visible to the next one.
 */
async function withOwnerLock<T>(
  ctx: AttachmentsContext,
  owner: AttachmentOwner,
  uploaderId: string,
  fn: (m: EntityManager) => Promise<T>,
): Promise<T> {
  const lockName = `lp_att_${crypto
    .createHash('sha1')
    .update(`${owner.type}:${owner.id ?? `draft:${uploaderId}`}`)
    .digest('hex')}`;
  const qr = ctx.ds.createQueryRunner();
  await qr.connect();
  let locked = false;
  try {
    const [row] = (await qr.query('SELECT GET_LOCK(?, 10) AS got', [lockName])) as {
      got: number | string | null;
    }[];
    locked = Number(row?.got) === 1;
    if (!locked)
      throw conflict('attachment.busy', 'Another upload to the same record is still being saved. Try again.');
    await qr.startTransaction();
    try {
      const result = await fn(qr.manager);
      await qr.commitTransaction();
      return result;
    } catch (err) {
      if (qr.isTransactionActive) await qr.rollbackTransaction();
      throw err;
    }
  } finally {
    if (locked) await qr.query('DO RELEASE_LOCK(?)', [lockName]).catch(() => undefined);
    await qr.release();
  }
}

export async function listAttachments(ctx: AttachmentsContext, owner: AttachmentOwner, uploaderId?: string) {
  checkOwner(owner);
  // Written out (server/db/read.ts): every claim page lists its files. Removed files (deleted_at) are left out, as
  // TypeORM's find leaves them out.
  const w = new Conditions().and('a.owner_type = ?', owner.type).and('a.deleted_at IS NULL');
  if (owner.id) w.and('a.owner_id = ?', owner.id);
  else w.and('a.owner_id IS NULL AND a.uploaded_by_id = ?', uploaderId ?? '');
  const rows = await readRows<Record<string, unknown>>(
    ctx.ds,
    `SELECT ${selectColumns(ctx.ds, Attachment, 'a')} FROM attachments a ${w.sql} ORDER BY a.created_at, a.id`,
    w.params,
  );
  return rows.map((r) => hydrate(ctx.ds, Attachment, r, 'a')!);
}

/** One attachment of an owner (not removed), or null: another owner's id is as missing as a made-up one. */
export function findAttachment(
  ctx: AttachmentsContext,
  owner: AttachmentOwner,
  id: string,
  uploaderId?: string,
) {
  checkOwner(owner);
  return ctx.ds.manager.findOne(Attachment, { where: { id, ...ownerWhere(owner, uploaderId) } });
}

export type OpenedAttachment = { attachment: Attachment; body: Readable; headers: Record<string, string> };

/** The response headers for a download: the detected type, never sniffed, never cached, never run. */
export function downloadHeaders(a: Attachment, variant: 'original' | 'thumbnail'): Record<string, string> {
  const thumb = variant === 'thumbnail';
  const name = thumb ? a.originalName.replace(/\.[A-Za-z0-9]+$/, '') + '-thumbnail.webp' : a.originalName;
  return {
    'Content-Type': thumb ? 'image/webp' : a.contentType,
    ...(thumb ? {} : { 'Content-Length': String(a.byteSize) }),
    'X-Content-Type-Options': 'nosniff',
    // Thumbnails are shown in the page (img tags); the file itself is always a download.
    'Content-Disposition': contentDisposition(name, thumb ? 'inline' : 'attachment'),
    'Cache-Control': 'private, no-store',
    'Content-Security-Policy': "sandbox; default-src 'none'",
    'Cross-Origin-Resource-Policy': 'same-origin',
  };
}

/**
 * Opens an attachment for download. canSee receives the attachment's owner (and who uploaded it) and answers
 * whether the caller may see it; false answers 404, exactly like a missing attachment.
 */
export async function openAttachment(
  ctx: AttachmentsContext,
  input: {
    id: string;
    ownerType: string;
    variant?: 'original' | 'thumbnail';
    canSee: (
      owner: AttachmentOwner & { uploadedById: string; organizationId: string },
    ) => boolean | Promise<boolean>;
  },
): Promise<OpenedAttachment> {
  const variant = input.variant ?? 'original';
  const a = await ctx.ds.manager.findOne(Attachment, { where: { id: input.id, ownerType: input.ownerType } });
  if (!a) throw notFound('attachment');
  const allowed = await input.canSee({
    type: a.ownerType,
    id: a.ownerId,
    uploadedById: a.uploadedById,
    organizationId: a.organizationId,
  });
  if (!allowed) throw notFound('attachment');
  const key = variant === 'thumbnail' ? a.thumbnailKey : a.storageKey;
  if (!key) throw notFound('thumbnail');
  try {
    return { attachment: a, body: await ctx.storage.get(key), headers: downloadHeaders(a, variant) };
  } catch (err) {
    if (err instanceof StorageObjectMissing) {
      ctx.logger.error({ attachmentId: a.id, key }, 'an attachment row has no stored object');
      throw new AppError(
        500,
        'attachment.file_missing',
        'The file for this attachment is missing. It has been logged.',
      );
    }
    throw err;
  }
}

/**
 * Removes an attachment from its owner. The row is kept (marked removed) and so are the stored bytes: a claim's
 * evidence is not destroyed by a click, and the audit log can still name what was removed.
 */
export async function removeAttachment(ctx: AttachmentsContext, a: Attachment, actor: Actor) {
  await ctx.ds.transaction(async (m) => {
    const result = await m.update(Attachment, { id: a.id, deletedAt: IsNull() }, { deletedAt: clock.now() });
    if (!result.affected) throw notFound('attachment');
    await recordAudit(m, actor, {
      action: 'attachment.removed',
      entityType: 'Attachment',
      entityId: a.id,
      before: auditView(a),
    });
  });
}

/**
 * Hands a draft's files (uploaded before their owner existed) to the new owner, inside the caller's transaction.
 * Only the uploader's own unowned files of that owner type move; any other id is a 400 and nothing moves.
 */
export async function adoptDraftAttachments(
  m: EntityManager,
  input: { ownerType: string; ownerId: string; uploaderId: string; ids: string[] },
) {
  const ids = [...new Set(input.ids)];
  if (ids.length === 0) return 0;
  const drafts = await m.find(Attachment, {
    where: { id: In(ids), ownerType: input.ownerType, ownerId: IsNull(), uploadedById: input.uploaderId },
  });
  if (drafts.length !== ids.length) {
    const found = new Set(drafts.map((d) => d.id));
    throw new AppError(400, 'validation.failed', 'The request has invalid fields.', [
      {
        path: 'attachmentIds',
        message: `No file of yours waiting to be attached has the id ${ids.find((i) => !found.has(i))}.`,
      },
    ]);
  }
  const existing = await countAttachments(m, { type: input.ownerType, id: input.ownerId });
  if (existing + drafts.length > MAX_ATTACHMENTS_PER_OWNER) throw limitReached();
  await m.update(Attachment, { id: In(ids) }, { ownerId: input.ownerId });
  return drafts.length;
}
