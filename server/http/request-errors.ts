import type { ErrorRequestHandler } from 'express';
import { AppError } from './errors';
import type { ErrorCode } from '../../shared/schemas/common';

/** Clear words for the refusals of the JSON body parser (body-parser's `type` codes). */
const BODY_ERRORS: Record<string, { status: number; code: ErrorCode; message: string }> = {
  'entity.parse.failed': { status: 400, code: 'invalid_json', message: 'The request body is not valid JSON' },
  'entity.too.large': { status: 413, code: 'payload_too_large', message: 'The request body is too large' },
  'charset.unsupported': { status: 415, code: 'unsupported_media_type', message: 'The request body’s charset is not supported: send UTF-8' },
  'encoding.unsupported': {
    status: 415,
    code: 'unsupported_media_type',
    message: 'The request body’s Content-Encoding is not supported: send it plain (identity), gzip, deflate or br',
  },
  'request.aborted': { status: 400, code: 'bad_request', message: 'The request body ended before it was complete' },
  'request.size.invalid': { status: 400, code: 'bad_request', message: 'The request body is shorter or longer than its Content-Length says' },
};

/**
 * Turns refusals of the request itself (a body that cannot be read, an address with bad
 * percent-encoding) into answers that say so. Registered just before the error handler; the
 * parsers mark these errors with a 4xx status, which would otherwise become a 500.
 */
export const requestErrors: ErrorRequestHandler = (err, _req, _res, next) => {
  if (err instanceof AppError || !err || typeof err !== 'object') return next(err);
  const status = Number((err as { status?: unknown }).status ?? (err as { statusCode?: unknown }).statusCode);
  if (err instanceof URIError && status === 400) {
    return next(new AppError(400, 'bad_request', 'The address is not valid: it holds a broken percent-encoded (%xx) character'));
  }
  const known = BODY_ERRORS[String((err as { type?: unknown }).type)];
  if (known) return next(new AppError(known.status, known.code, known.message));
  // Any other refusal the HTTP layer raised with a 4xx status and a message meant for the client.
  if (status >= 400 && status < 500 && (err as { expose?: unknown }).expose === true) {
    const zlib = /incorrect header check|unexpected end of file|invalid (block|distance|stored)/i.test(String((err as Error).message));
    return next(
      new AppError(
        status,
        'bad_request',
        zlib ? 'The request body is not valid for its Content-Encoding' : `The request was refused: ${(err as Error).message}`,
      ),
    );
  }
  next(err);
};
