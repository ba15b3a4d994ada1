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

export type AttachmentDto = {
  id: string;
  kind: AttachmentKind;
  purpose: AttachmentPurpose;
  name: string;
  contentType: string;
  byteSize: number;
  width: number | null;
  height: number | null;
  capturedAt: string | null;
  /** Where to download the file (as an attachment) and its thumbnail (photos only). */
  contentUrl: string;
  thumbnailUrl: string | null;
  /** The uploader to their own organisation; null to the other side of a claim. */
  uploadedBy: { id: string | null };
  createdAt: string;
};
