import type { ErrorRequestHandler } from 'express';
import { NotFoundError, UniqueConstraintViolationException, ForeignKeyConstraintViolationException } from '@mikro-orm/core';
import { AppError } from './errors';
import { isDatabaseUnavailable } from '../db-faults';
import type { ApiErrorBody } from '../../shared/schemas/common';

/** The one place errors become HTTP answers. No stack traces leave the server. */
export const errorHandler: ErrorRequestHandler = (err, req, res, _next) => {
  let status = 500;
  let body: ApiErrorBody = { error: 'internal', message: 'Something went wrong on our side. It has been logged.' };
  if (err instanceof AppError) {
    status = err.status;
    body = { error: err.code, message: err.message, ...(err.fields ? { fields: err.fields } : {}) };
  } else if (err instanceof NotFoundError) {
    status = 404;
    body = { error: 'not_found', message: 'Record not found' };
  } else if (err instanceof UniqueConstraintViolationException) {
    status = 409;
    body = { error: 'conflict', message: 'A record with these values already exists' };
  } else if (err instanceof ForeignKeyConstraintViolationException) {
    status = 409;
    body = { error: 'conflict', message: 'This record is still referenced by other records' };
  } else if (isDatabaseUnavailable(err)) {
    // Lost or unreachable database: the client may retry; the process stays up and reconnects.
    status = 503;
    res.set('Retry-After', '5');
    body = { error: 'database_unavailable', message: 'The database is unavailable right now. Try again in a moment.' };
    req.log?.warn({ err: { message: err?.message, code: err?.code } }, 'database unavailable');
  } else if (err?.type === 'entity.parse.failed') {
    status = 400;
    body = { error: 'invalid_json', message: 'The request body is not valid JSON' };
  } else if (err?.type === 'entity.too.large') {
    status = 413;
    body = { error: 'payload_too_large', message: 'The request body is too large' };
  }
  if (status >= 500) req.log?.error({ err }, 'request failed');
  res.status(status).json(body);
};
