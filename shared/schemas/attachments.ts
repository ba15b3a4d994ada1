import { z } from 'zod';

// Attachments of claims (and of anything else that takes files): what the client sends beside the file and the
// shape it gets back.

export const ATTACHMENT_KINDS = ['photo', 'document'] as const;
export type AttachmentKind = (typeof ATTACHMENT_KINDS)[number];

export const ATTACHMENT_PURPOSES = ['nameplate', 'failure', 'site', 'proof_of_purchase', 'other'] as const;
export type AttachmentPurpose = (typeof ATTACHMENT_PURPOSES)[number];

export const ATTACHMENT_PURPOSE_LABELS: Record<AttachmentPurpose, string> = {
  nameplate: 'Nameplate or label',
  failure: 'The failure',
  site: 'The site',
  proof_of_purchase: 'Proof of purchase',
  other: 'Other',
};

/** The text fields of the multipart upload (the file itself travels as the part named "file"). */
export const uploadAttachmentSchema = z.strictObject({
  purpose: z.enum(ATTACHMENT_PURPOSES, { error: 'Choose what the file shows.' }).default('other'),
});
export type UploadAttachmentInput = z.infer<typeof uploadAttachmentSchema>;

export const MAX_ATTACHMENT_MB = 15;
export const MAX_ATTACHMENTS_PER_OWNER = 20;
export const ACCEPTED_ATTACHMENT_TYPES = [
  'image/jpeg',
  'image/png',
  'image/webp',
  'application/pdf',
] as const;

/** A file as the answers show it (attachments.presenter.ts). */
export const attachmentSchema = z.object({
  id: z.uuid(),
  kind: z.enum(ATTACHMENT_KINDS),
  purpose: z.enum(ATTACHMENT_PURPOSES),
  name: z.string(),
  contentType: z.string(),
  byteSize: z.number().int().min(0),
  width: z.number().int().nullable(),
  height: z.number().int().nullable(),
  capturedAt: z.iso.datetime({ offset: true }).nullable(),
  /** Where to download the file (as an attachment) and its thumbnail (photos only). */
  contentUrl: z.string(),
  thumbnailUrl: z.string().nullable(),
  /** The uploader to their own organisation; null to the other side of a claim. */
  uploadedBy: z.object({ id: z.uuid().nullable() }),
  createdAt: z.iso.datetime({ offset: true }),
});
export type AttachmentDto = z.infer<typeof attachmentSchema>;
