import type { AttachmentDto, AttachmentPurpose } from '../../../../shared/schemas/attachments';
import { api, ApiError } from '../../../lib/api-client';

/**
 * Uploads one file with XMLHttpRequest, which (unlike fetch) reports upload progress. Resolves with the stored
 * attachment; rejects with an ApiError (status 0 when the connection dropped).
 */
export function uploadClaimFile(
  claimId: string,
  file: File,
  purpose: AttachmentPurpose,
  onProgress: (fraction: number) => void,
  signal?: AbortSignal,
): Promise<AttachmentDto> {
  return new Promise((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open('POST', `/api/claims/${encodeURIComponent(claimId)}/attachments`);
    xhr.withCredentials = true;
    xhr.setRequestHeader('Accept', 'application/json');
    xhr.upload.onprogress = (e) => {
      if (e.lengthComputable) onProgress(e.loaded / e.total);
    };
    xhr.onload = () => {
      let body: { attachment?: AttachmentDto; error?: { code: string; message: string } } | undefined;
      try {
        body = JSON.parse(xhr.responseText);
      } catch {
        body = undefined;
      }
      if (xhr.status === 201 && body?.attachment) {
        onProgress(1);
        resolve(body.attachment);
      } else {
        reject(
          new ApiError(
            xhr.status,
            body?.error?.code ?? 'http.error',
            body?.error?.message ?? `The server answered ${xhr.status}.`,
          ),
        );
      }
    };
    xhr.onerror = () =>
      reject(new ApiError(0, 'network.offline', 'The upload was cut off. Check the connection and retry.'));
    xhr.onabort = () => reject(new ApiError(0, 'upload.aborted', 'Upload cancelled.'));
    signal?.addEventListener('abort', () => xhr.abort());
    const form = new FormData();
    form.append('purpose', purpose);
    form.append('file', file, file.name);
    xhr.send(form);
  });
}

export const removeClaimFile = (claimId: string, attachmentId: string) =>
  api<void>(`/claims/${encodeURIComponent(claimId)}/attachments/${encodeURIComponent(attachmentId)}`, {
    method: 'DELETE',
  });
