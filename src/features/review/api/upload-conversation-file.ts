import type { AttachmentDto } from '../../../../shared/schemas/attachments';
import { api } from '../../../lib/api-client';

/** A file for the next answer in the claim's conversation: multipart, one file a request, like claim files. */
export function uploadConversationFile(claimId: string, file: File) {
  const form = new FormData();
  form.append('purpose', 'other');
  form.append('file', file, file.name);
  return api<{ attachment: AttachmentDto }>(`/claims/${encodeURIComponent(claimId)}/conversation/uploads`, {
    method: 'POST',
    body: form,
  });
}
