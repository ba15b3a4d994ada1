import type { AttachmentDto } from '../../../shared/schemas/attachments';
import type { Attachment } from '../../db/entities/attachment.entity';

/** `base` is the collection's address, e.g. /api/claims/<id>/attachments. */
export function presentAttachment(a: Attachment, base: string): AttachmentDto {
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
    uploadedBy: { id: a.uploadedById },
    createdAt: a.createdAt.toISOString(),
  };
}
