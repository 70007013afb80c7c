import session from 'express-session';
import connectPgSimple from 'connect-pg-simple';
import pg from 'pg';
import { randomBytes, timingSafeEqual } from 'node:crypto';
import type { RequestHandler } from 'express';
import type { Config } from '../config';
import { csrfInvalid } from './errors';

export const SESSION_COOKIE = 'kerfbook.sid';

/** Sessions live in PostgreSQL so several instances behind a load balancer share them. */
export function createSessionMiddleware(config: Config, pool: pg.Pool): RequestHandler {
  const PgStore = connectPgSimple(session);
  return session({
    name: SESSION_COOKIE,
    store: new PgStore({ pool, tableName: 'session', createTableIfMissing: false, pruneSessionInterval: 15 * 60 }),
    secret: config.SESSION_SECRET,
    resave: false,
    saveUninitialized: false,
    rolling: true, // idle timeout: every request pushes expiry forward
    cookie: {
      httpOnly: true,
      sameSite: 'lax',
      secure: 'auto', // Secure whenever the request came over HTTPS (trust proxy decides behind a balancer)
      maxAge: config.SESSION_IDLE_MINUTES * 60_000,
    },
  });
}

export function ensureCsrfToken(req: Express.Request): string {
  const s = req.session;
  s.csrfToken ??= randomBytes(24).toString('base64url');
  return s.csrfToken;
}

const SAFE = new Set(['GET', 'HEAD', 'OPTIONS']);

/** Every state-changing request must echo the session's token in X-CSRF-Token. */
export const csrfProtection: RequestHandler = (req, _res, next) => {
  if (SAFE.has(req.method)) return next();
  const expected = req.session?.csrfToken;
  const sent = req.get('x-csrf-token');
  if (!expected || !sent) return next(csrfInvalid('Missing CSRF token: fetch /api/auth/csrf and send it as X-CSRF-Token'));
  const a = Buffer.from(expected);
  const b = Buffer.from(sent);
  if (a.length !== b.length || !timingSafeEqual(a, b)) return next(csrfInvalid('Invalid CSRF token'));
  next();
};

export function regenerate(req: Express.Request): Promise<void> {
  return new Promise((resolve, reject) => req.session.regenerate((err) => (err ? reject(err) : resolve())));
}
export function destroy(req: Express.Request): Promise<void> {
  return new Promise((resolve, reject) => req.session.destroy((err) => (err ? reject(err) : resolve())));
}
export function save(req: Express.Request): Promise<void> {
  return new Promise((resolve, reject) => req.session.save((err) => (err ? reject(err) : resolve())));
}
