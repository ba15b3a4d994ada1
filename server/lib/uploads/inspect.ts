import crypto from 'node:crypto';
import exifr from 'exifr';
import { fileTypeFromBuffer } from 'file-type';
import sharp from 'sharp';
import { MAX_ATTACHMENT_MB, type AttachmentKind } from '../../../shared/schemas/attachments';
import { AppError } from '../errors';
import { safeDisplayName } from './names';
import { checkPdf } from './pdf';

// What an upload really is, decided from its bytes (never its name or the browser's Content-Type), and the
// form it is kept in: images decoded and encoded again (which drops EXIF, GPS, and anything appended after the
// image data), PDFs kept as sent once they are known to be passive.

export const MAX_FILE_BYTES = MAX_ATTACHMENT_MB * 1024 * 1024;
export const MAX_INPUT_PIXELS = 40_000_000;
export const THUMBNAIL_SIZE = 320;

export const ACCEPTED_TYPES = {
  'image/jpeg': { kind: 'photo', extensions: ['jpg', 'jpeg'] },
  'image/png': { kind: 'photo', extensions: ['png'] },
  'image/webp': { kind: 'photo', extensions: ['webp'] },
  'application/pdf': { kind: 'document', extensions: ['pdf'] },
} as const satisfies Record<string, { kind: AttachmentKind; extensions: readonly string[] }>;

export type AcceptedType = keyof typeof ACCEPTED_TYPES;

export type InspectedUpload = {
  kind: AttachmentKind;
  contentType: AcceptedType;
  /** The bytes to store: re-encoded for images, as sent for PDFs. */
  body: Buffer;
  sha256: string;
  displayName: string;
  width: number | null;
  height: number | null;
  /** When the photo was taken, from its EXIF, read before the metadata is dropped. */
  capturedAt: Date | null;
  thumbnail: { body: Buffer; contentType: 'image/webp'; width: number; height: number } | null;
};

export const unsupportedType = () =>
  new AppError(
    415,
    'attachment.unsupported_type',
    'Only photos (JPEG, PNG or WebP) and PDF documents can be attached.',
  );
const imageUnreadable = () =>
  new AppError(
    422,
    'attachment.unreadable',
    'This image is damaged or incomplete. Take or export it again and upload the new file.',
  );
const tooManyPixels = () =>
  new AppError(
    422,
    'attachment.too_many_pixels',
    `This image is too large in pixels (over ${MAX_INPUT_PIXELS / 1_000_000} megapixels). Resize it and upload it again.`,
  );

const EXIF_DATE = /^(\d{4}):(\d{2}):(\d{2}) (\d{2}):(\d{2}):(\d{2})(?:\.(\d{1,3}))?/;

/**
 * DateTimeOriginal (with OffsetTimeOriginal when the camera wrote one). Without an offset the camera's wall-clock
 * time is kept as if it were UTC: EXIF carries no zone, and the claim's site tells the reader where it was.
 */
export async function readCaptureTime(buffer: Buffer): Promise<Date | null> {
  let tags: { DateTimeOriginal?: unknown; OffsetTimeOriginal?: unknown } | undefined;
  try {
    tags = await exifr.parse(buffer, {
      pick: ['DateTimeOriginal', 'OffsetTimeOriginal'],
      reviveValues: false,
      translateValues: false,
    });
  } catch {
    return null; // unreadable EXIF is no reason to refuse a photo
  }
  const raw = typeof tags?.DateTimeOriginal === 'string' ? tags.DateTimeOriginal : null;
  const m = raw ? EXIF_DATE.exec(raw.trim()) : null;
  if (!m) return null;
  const offset =
    typeof tags?.OffsetTimeOriginal === 'string' && /^[+-]\d{2}:\d{2}$/.test(tags.OffsetTimeOriginal)
      ? tags.OffsetTimeOriginal
      : 'Z';
  const ms = (m[7] ?? '0').padEnd(3, '0');
  const date = new Date(`${m[1]}-${m[2]}-${m[3]}T${m[4]}:${m[5]}:${m[6]}.${ms}${offset}`);
  const year = date.getUTCFullYear();
  return Number.isNaN(date.getTime()) || year < 1990 || year > 2200 ? null : date;
}

function sharpError(err: unknown): AppError {
  const message = err instanceof Error ? err.message : '';
  if (/pixel limit/i.test(message)) return tooManyPixels();
  return imageUnreadable();
}

async function reencodeImage(buffer: Buffer, type: Exclude<AcceptedType, 'application/pdf'>) {
  // failOn 'warning': a truncated or corrupt image is refused rather than stored with grey bands.
  const input = { limitInputPixels: MAX_INPUT_PIXELS, failOn: 'warning' as const, sequentialRead: true };
  try {
    const meta = await sharp(buffer, input).metadata();
    if (!meta.width || !meta.height) throw imageUnreadable();
    if (meta.width * meta.height > MAX_INPUT_PIXELS) throw tooManyPixels();
    // rotate() applies the EXIF orientation to the pixels; no withMetadata(): the output carries none.
    const pipeline = sharp(buffer, input).rotate();
    const encoded =
      type === 'image/jpeg'
        ? pipeline.jpeg({ quality: 88, mozjpeg: true })
        : type === 'image/png'
          ? pipeline.png({ compressionLevel: 9 })
          : pipeline.webp({ quality: 88 });
    const { data, info } = await encoded.toBuffer({ resolveWithObject: true });
    const thumb = await sharp(data)
      .resize(THUMBNAIL_SIZE, THUMBNAIL_SIZE, { fit: 'inside', withoutEnlargement: true })
      .webp({ quality: 75 })
      .toBuffer({ resolveWithObject: true });
    return {
      body: data,
      width: info.width,
      height: info.height,
      thumbnail: {
        body: thumb.data,
        contentType: 'image/webp' as const,
        width: thumb.info.width,
        height: thumb.info.height,
      },
    };
  } catch (err) {
    throw err instanceof AppError ? err : sharpError(err);
  }
}

/** Decides what an upload is and prepares what is kept; throws an AppError (413, 415, 422) to refuse it. */
export async function inspectUpload(
  buffer: Buffer,
  declaredName: string | undefined,
): Promise<InspectedUpload> {
  if (buffer.length === 0) {
    throw new AppError(400, 'validation.failed', 'The request has invalid fields.', [
      { path: 'file', message: 'The file is empty.' },
    ]);
  }
  if (buffer.length > MAX_FILE_BYTES) throw tooLarge();
  const detected = await fileTypeFromBuffer(buffer);
  const contentType = detected?.mime as AcceptedType | undefined;
  if (!contentType || !(contentType in ACCEPTED_TYPES)) throw unsupportedType();
  const accepted = ACCEPTED_TYPES[contentType];
  const displayName = safeDisplayName(
    declaredName,
    accepted.extensions,
    accepted.kind === 'photo' ? 'photo' : 'document',
  );

  if (contentType === 'application/pdf') {
    await checkPdf(buffer);
    return {
      kind: 'document',
      contentType,
      body: buffer,
      sha256: sha256(buffer),
      displayName,
      width: null,
      height: null,
      capturedAt: null,
      thumbnail: null,
    };
  }

  // The capture time first: re-encoding drops the EXIF it lives in.
  const capturedAt = await readCaptureTime(buffer);
  const image = await reencodeImage(buffer, contentType);
  return {
    kind: 'photo',
    contentType,
    body: image.body,
    sha256: sha256(image.body),
    displayName,
    width: image.width,
    height: image.height,
    capturedAt,
    thumbnail: image.thumbnail,
  };
}

export const tooLarge = () =>
  new AppError(413, 'attachment.too_large', `Each file can be at most ${MAX_FILE_BYTES / 1024 / 1024} MB.`);

const sha256 = (b: Buffer) => crypto.createHash('sha256').update(b).digest('hex');
