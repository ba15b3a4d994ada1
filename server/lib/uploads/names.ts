// File names as people send them are display text only: they never reach the file system (stored objects have
// random keys) and they go back out only inside a Content-Disposition header built here.

export const MAX_NAME_LENGTH = 120;

// C0 and C1 controls, bidirectional embeddings, overrides and isolates, directional marks, zero-width characters.
// eslint-disable-next-line no-control-regex -- matching control characters is the point
const INVISIBLE = /[\u0000-\u001f\u007f-\u009f\u061c\u200b-\u200f\u202a-\u202e\u2060-\u2069\ufeff]/g;
// Characters Windows and most file systems refuse in a name.
const RESERVED = /[<>:"|?*]/g;

/**
 * A display name for an upload: no folders, no control or bidi characters, at most MAX_NAME_LENGTH characters,
 * ending in the extension of the type the bytes turned out to be (the declared extension is replaced when it
 * does not belong to that type).
 */
export function safeDisplayName(
  declared: string | undefined,
  extensions: readonly string[],
  fallback: string,
): string {
  const canonical = extensions[0];
  let name = (declared ?? '').normalize('NFC').replace(INVISIBLE, '');
  name = name.split(/[/\\]/).pop() ?? '';
  name = name.replace(RESERVED, '_').replace(/\s+/g, ' ').trim();
  name = name.replace(/^[.\s]+|[.\s]+$/g, '');

  const match = /^(.*)\.([A-Za-z0-9]{1,8})$/.exec(name);
  let stem = match ? match[1] : name;
  let ext = match ? match[2].toLowerCase() : '';
  if (!extensions.includes(ext)) ext = canonical;
  stem = stem.replace(/[.\s]+$/g, '');
  if (!stem) stem = fallback;

  const room = MAX_NAME_LENGTH - ext.length - 1;
  const chars = Array.from(stem);
  if (chars.length > room) stem = chars.slice(0, room).join('').trimEnd();
  return `${stem}.${ext}`;
}

// RFC 5987 attr-char: ALPHA / DIGIT / "!" / "#" / "$" / "&" / "+" / "-" / "." / "^" / "_" / "`" / "|" / "~"
const encodeRfc5987 = (s: string) =>
  encodeURIComponent(s).replace(/['()*]/g, (c) => `%${c.charCodeAt(0).toString(16).toUpperCase()}`);

/** `attachment; filename="ascii"; filename*=UTF-8''…` (RFC 6266): an ASCII fallback and the exact name. */
export function contentDisposition(
  name: string,
  disposition: 'attachment' | 'inline' = 'attachment',
): string {
  const clean = name.replace(INVISIBLE, '');
  const ascii = clean
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .replace(/[^\x20-\x7e]/g, '_')
    .replace(/["\\]/g, '_');
  return `${disposition}; filename="${ascii}"; filename*=UTF-8''${encodeRfc5987(clean)}`;
}
