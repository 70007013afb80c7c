import { mkdir, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { NextFunction, RequestHandler } from 'express';
import multer from 'multer';
import { AppError, badRequest, payloadTooLarge } from './errors';

/** The multipart parser could not read the form (cut off, no boundary, broken part headers). */
export function unreadableMultipart(err: unknown, field: string) {
  const message = `The upload could not be read (${err instanceof Error ? err.message : 'broken form data'}); send it again`;
  return badRequest(message, [{ path: field, message }]);
}

/**
 * One file from a multipart form, held in memory up to `maxBytes` (callers check its content).
 * Multer's refusals become answers that name the field: 413 with the cap for a file too large,
 * 400 otherwise.
 */
export function singleFileUpload(field: string, maxBytes: number, noun = 'file'): RequestHandler {
  const parse = multer({ storage: multer.memoryStorage(), limits: { fileSize: maxBytes, files: 1, fields: 5 } }).single(field);
  return (req, res, next) => {
    if (!req.is('multipart/form-data')) {
      const message = `Send the ${noun} as multipart/form-data (form field “${field}”)`;
      return next(new AppError(415, 'unsupported_media_type', message, [{ path: field, message }]));
    }
    parse(req, res, (err: unknown) => {
      if (!err) return next();
      if (err instanceof multer.MulterError && err.code === 'LIMIT_FILE_SIZE') {
        const message = `The ${noun} is larger than ${maxBytes / 1024 / 1024} MB`;
        return next(payloadTooLarge(message, [{ path: field, message }]));
      }
      if (err instanceof multer.MulterError) return next(badRequest(`Upload refused: ${err.message}`, [{ path: field, message: err.message }]));
      next(unreadableMultipart(err, field));
    });
  };
}

const uploadDir = join(tmpdir(), 'kerfbook-uploads');

/**
 * One file from a multipart form, streamed to a temporary file (`req.file.path`) so a large
 * upload never sits whole in memory; the file is removed when the response is done. Errors
 * pass to `onError`, which turns multer's refusals into answers.
 */
export function singleFileToDisk(field: string, maxBytes: number, onError: (err: unknown, next: NextFunction) => void): RequestHandler {
  const parse = multer({
    storage: multer.diskStorage({
      destination: (_req, _file, cb) =>
        mkdir(uploadDir, { recursive: true }).then(
          () => cb(null, uploadDir),
          (e: Error) => cb(e, uploadDir),
        ),
    }),
    limits: { fileSize: maxBytes, files: 1, fields: 5 },
  }).single(field);
  return (req, res, next) => {
    res.on('close', () => {
      if (req.file?.path) void rm(req.file.path, { force: true });
    });
    parse(req, res, (err: unknown) => (err ? onError(err, next) : next()));
  };
}
