import type pg from 'pg';
import { ConnectionException } from '@mikro-orm/core';
import { logger } from './logger';

// SQLSTATEs that mean "the database is not there just now", not "your request is wrong":
// class 08 (connection exception), 57P01-57P03 (terminated by an administrator, crash,
// starting up or shutting down), 53300 (too many connections).
const UNAVAILABLE_SQLSTATES = new Set(['57P01', '57P02', '57P03', '53300']);
const UNAVAILABLE_ERRNOS = new Set(['ECONNREFUSED', 'ECONNRESET', 'ETIMEDOUT', 'EPIPE', 'EHOSTUNREACH', 'ENETUNREACH', 'ENOTFOUND', 'EAI_AGAIN']);
// pg and knex report a lost or unobtainable connection by message only.
const UNAVAILABLE_MESSAGES =
  /Connection terminated|Connection ended unexpectedly|not queryable|timeout exceeded when trying to connect|^timeout expired$|Timeout acquiring a connection|the database system is (starting up|shutting down|in recovery mode)/i;

/** True when `err` (or an error it wraps) says the database is unreachable, so the answer is 503, not 500. */
export function isDatabaseUnavailable(err: unknown, depth = 0): boolean {
  if (!err || typeof err !== 'object' || depth > 5) return false;
  if (err instanceof ConnectionException) return true;
  const e = err as { code?: unknown; name?: unknown; message?: unknown; cause?: unknown };
  const code = typeof e.code === 'string' ? e.code : '';
  if (code.startsWith('08') || UNAVAILABLE_SQLSTATES.has(code) || UNAVAILABLE_ERRNOS.has(code)) return true;
  if (e.name === 'KnexTimeoutError') return true;
  if (typeof e.message === 'string' && UNAVAILABLE_MESSAGES.test(e.message)) return true;
  return isDatabaseUnavailable(e.cause, depth + 1);
}

/**
 * A pg.Pool emits 'error' when one of its idle clients loses its connection (a terminated
 * backend, a restart, a failover); with no listener Node ends the process. The pool has
 * already dropped the client, so logging is all that is left to do.
 */
export function keepPoolAlive(pool: pg.Pool, name: string): pg.Pool {
  pool.on('error', (err) =>
    logger.warn(
      { pool: name, err: { message: err.message, code: (err as { code?: string }).code } },
      'database connection lost (idle); the pool reconnects on next use',
    ),
  );
  return pool;
}
