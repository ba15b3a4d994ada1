import { createHash } from 'node:crypto';

/** The sha256 of a generated document, stored beside it so that a copy can be checked later. */
export function sha256Hex(data: Buffer | Uint8Array | string): string {
  return createHash('sha256').update(data).digest('hex');
}

/** JSON with object keys sorted, so that the same data always gives the same text (and the same digest). */
export function canonicalJson(value: unknown): string {
  return JSON.stringify(value, (_key, v: unknown) => {
    if (v === null || typeof v !== 'object' || Array.isArray(v) || Buffer.isBuffer(v)) return v;
    const sorted: Record<string, unknown> = {};
    for (const k of Object.keys(v as Record<string, unknown>).sort())
      sorted[k] = (v as Record<string, unknown>)[k];
    return sorted;
  });
}
