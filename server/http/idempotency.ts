import { createHash } from 'node:crypto';
import type { Request, RequestHandler } from 'express';
import { requestEm } from '../db';
import { logger } from '../logger';
import { AppError } from './errors';
import { clock } from '../../shared/clock';
import { IDEMPOTENCY_HEADER, IDEMPOTENCY_KEY_PATTERN, IDEMPOTENCY_TTL_HOURS } from '../../shared/schemas/common';

/** The same JSON whatever the order of its keys. */
function canonical(value: unknown): string {
  if (Array.isArray(value)) return `[${value.map(canonical).join(',')}]`;
  if (value && typeof value === 'object') {
    const entries = Object.entries(value as Record<string, unknown>)
      .filter(([, v]) => v !== undefined)
      .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
    return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${canonical(v)}`).join(',')}}`;
  }
  return JSON.stringify(value ?? null);
}

/**
 * What makes two requests "the same": the body and any uploaded file. A signing password is
 * left out, so no digest of it is stored; the key is bound to the signed-in person anyway, and a
 * replay only repeats an answer that person already had.
 */
function fingerprint(req: Request): string {
  const body = req.body && typeof req.body === 'object' && !Array.isArray(req.body) ? { ...(req.body as Record<string, unknown>) } : req.body;
  if (body && typeof body === 'object' && 'password' in body) delete (body as Record<string, unknown>).password;
  const h = createHash('sha256').update(canonical(body ?? null));
  if (req.file?.buffer) h.update('\0file\0').update(req.file.buffer);
  return h.digest('hex');
}

type Stored = { endpoint: string; request_hash: string; status_code: number | null; response_body: unknown };

/**
 * Idempotent writes (route()'s `idempotent` option). A request carrying an `Idempotency-Key`
 * reserves it for the signed-in person in their shop; the handler's successful answer is
 * stored with it, so a retry of the same request (a lost answer, a double tap) gets that answer
 * again, with `Idempotent-Replayed: true`, and nothing is written twice. An error answer frees
 * the key. A key reused for another body is refused (422 idempotency_key_reused); one whose first
 * request is still running is 409 idempotency_in_progress. Keys are kept IDEMPOTENCY_TTL_HOURS.
 * Without the header the request runs as usual.
 */
export const idempotency: RequestHandler = async (req, res, next) => {
  const key = req.get(IDEMPOTENCY_HEADER);
  if (key === undefined) return next();
  if (!IDEMPOTENCY_KEY_PATTERN.test(key)) {
    return next(
      new AppError(400, 'bad_request', `The ${IDEMPOTENCY_HEADER} header must be 8 to 200 letters, digits, dots, dashes, underscores or colons`, [
        { path: IDEMPOTENCY_HEADER, message: 'Not a usable key' },
      ]),
    );
  }
  const who = req.principal!;
  const conn = requestEm().getConnection();
  const endpoint = `${req.method} ${req.originalUrl.split('?')[0]}`.slice(0, 300);
  const requestHash = fingerprint(req);
  const now = clock.now();
  // An expired key is as good as new.
  await conn.execute(`delete from idempotency_key where organization_id = ? and user_id = ? and key = ? and expires_at <= ?`, [
    who.orgId,
    who.userId,
    key,
    now,
  ]);
  const reserved = await conn.execute<{ id: string }[]>(
    `insert into idempotency_key (id, organization_id, user_id, key, endpoint, request_hash, created_at, expires_at)
     values (gen_random_uuid(), ?, ?, ?, ?, ?, ?, ?) on conflict (organization_id, user_id, key) do nothing returning id`,
    [who.orgId, who.userId, key, endpoint, requestHash, now, new Date(now.getTime() + IDEMPOTENCY_TTL_HOURS * 3_600_000)],
  );
  if (reserved.length === 0) {
    const [prior] = await conn.execute<Stored[]>(
      `select endpoint, request_hash, status_code, response_body from idempotency_key where organization_id = ? and user_id = ? and key = ?`,
      [who.orgId, who.userId, key],
    );
    if (prior && (prior.endpoint !== endpoint || prior.request_hash !== requestHash)) {
      return next(
        new AppError(
          422,
          'idempotency_key_reused',
          'This request reuses the key of a different request, so it was not carried out. Start the action again to send it with a new key.',
        ),
      );
    }
    if (!prior || prior.status_code === null) {
      return next(
        new AppError(409, 'idempotency_in_progress', 'The same request is still being carried out (or was cut off). Reload to see whether it was saved.'),
      );
    }
    res.setHeader('Idempotent-Replayed', 'true');
    return void res.status(prior.status_code).json(prior.response_body);
  }
  const id = reserved[0].id;
  let settled = false;
  const send = res.json.bind(res);
  // The answer is stored before it is sent, so a retry that arrives once the client has it finds it.
  res.json = (body: unknown) => {
    settled = true;
    const status = res.statusCode;
    const store =
      status >= 200 && status < 300
        ? conn.execute(`update idempotency_key set status_code = ?, response_body = ?::jsonb where id = ?`, [status, JSON.stringify(body ?? null), id])
        : conn.execute(`delete from idempotency_key where id = ?`, [id]);
    store.catch((err: unknown) => logger.error({ err, endpoint }, 'storing the answer of an idempotent request failed')).finally(() => send(body));
    return res;
  };
  // An answer not sent as JSON (none of the idempotent routes do this) frees the key rather than leaving it reserved.
  res.on('finish', () => {
    if (!settled) conn.execute(`delete from idempotency_key where id = ? and status_code is null`, [id]).catch(() => undefined);
  });
  next();
};
