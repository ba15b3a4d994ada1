import type { Request, Response } from 'express';
import multer from 'multer';
import { MAX_FILE_BYTES, tooLarge } from '../lib/uploads/inspect';
import { AppError } from '../lib/errors';

// One file per request, held in memory (at most 15 MB) until it has been inspected: nothing touches the disk
// before the bytes are known to be acceptable.
export const UPLOAD_FIELD = 'file';

const parser = multer({
  storage: multer.memoryStorage(),
  // Browsers send file names as raw UTF-8 in the part header.
  defParamCharset: 'utf8',
  limits: {
    fileSize: MAX_FILE_BYTES,
    files: 1,
    fields: 10,
    fieldSize: 4096,
    fieldNameSize: 100,
    parts: 12,
    headerPairs: 200,
  },
}).single(UPLOAD_FIELD);

const tooManyFiles = () => new AppError(413, 'attachment.too_many_files', 'Send one file per request.');

function mapMulterError(err: unknown): AppError {
  if (err instanceof AppError) return err;
  if (err instanceof multer.MulterError) {
    switch (err.code) {
      case 'LIMIT_FILE_SIZE':
        return tooLarge();
      case 'LIMIT_FILE_COUNT':
        return tooManyFiles();
      case 'LIMIT_UNEXPECTED_FILE':
        return err.field === UPLOAD_FIELD
          ? tooManyFiles()
          : new AppError(400, 'validation.failed', 'The request has invalid fields.', [
              { path: err.field ?? '(form)', message: `Send the file in the field named "${UPLOAD_FIELD}".` },
            ]);
      default:
        return new AppError(
          400,
          'request.invalid_form',
          'The form has too many fields or a field that is too long.',
        );
    }
  }
  return new AppError(
    400,
    'request.malformed_multipart',
    'The upload was cut off or is not a valid multipart form.',
  );
}

/**
 * Reads the multipart body of an upload request and returns its one file. Called by a route after it has
 * authorised the request, so that nobody's 15 MB is buffered for nothing.
 */
export function receiveFile(req: Request, res: Response): Promise<Express.Multer.File> {
  if (!req.is('multipart/form-data')) {
    return Promise.reject(
      new AppError(
        415,
        'request.unsupported_media_type',
        'Send the file as multipart/form-data, in a field named "file".',
      ),
    );
  }
  return new Promise((resolve, reject) => {
    parser(req, res, (err?: unknown) => {
      if (err) return reject(mapMulterError(err));
      if (!req.file) {
        return reject(
          new AppError(400, 'validation.failed', 'The request has invalid fields.', [
            { path: UPLOAD_FIELD, message: 'Choose a file to upload.' },
          ]),
        );
      }
      resolve(req.file);
    });
  });
}
