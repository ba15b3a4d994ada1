import type { AttachmentDto } from '../../../shared/schemas/attachments';
import type { Attachment } from '../../db/entities/attachment.entity';

/**
 * `base` is the collection's address, e.g. /api/claims/<id>/attachments. The uploader is identified to their own
 * organisation only; the other side of a claim sees the file, not who in the other organisation sent it.
 */
export function presentAttachment(a: Attachment, base: string, viewerOrgId: string): AttachmentDto {
  return {
    id: a.id,
    kind: a.kind,
    purpose: a.purpose,
    name: a.originalName,
    contentType: a.contentType,
    byteSize: a.byteSize,
    width: a.width,
    height: a.height,
    capturedAt: a.capturedAt ? a.capturedAt.toISOString() : null,
    contentUrl: `${base}/${a.id}/content`,
    thumbnailUrl: a.thumbnailKey ? `${base}/${a.id}/thumbnail` : null,
    uploadedBy: { id: a.organizationId === viewerOrgId ? a.uploadedById : null },
    createdAt: a.createdAt.toISOString(),
  };
}
