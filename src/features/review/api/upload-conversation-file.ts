import { api } from '../../../lib/api-client';

async function toBase64(file: File): Promise<string> {
  const bytes = new Uint8Array(await file.arrayBuffer());
  let binary = '';
  for (let i = 0; i < bytes.length; i += 0x8000) binary += String.fromCharCode(...bytes.subarray(i, i + 0x8000));
  return btoa(binary);
}

/** A file for the next answer in the claim's conversation. */
export async function uploadConversationFile(claimId: string, file: File) {
  return api<{ file: { id: string; name: string; contentType: string } }>(`/claims/${claimId}/conversation/files`, {
    method: 'POST',
    json: { name: file.name, purpose: 'other', dataBase64: await toBase64(file) },
  });
}
