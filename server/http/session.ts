import session from 'express-session';
import connectPgSimple from 'connect-pg-simple';
import pg from 'pg';
import { randomBytes, timingSafeEqual } from 'node:crypto';
import { sign } from 'cookie-signature';
import type { Request, RequestHandler } from 'express';
import type { Config } from '../config';
import { csrfInvalid } from './errors';
import type { Principal } from './principal';

export const SESSION_COOKIE = 'kerfbook.sid';

/**
 * How often an active session's row has its expiry pushed forward. Writing it on every request
 * made each read a write; an idle timeout of minutes or hours loses nothing by moving in steps
 * of a minute (a session may end up to this much before a full idle period has passed).
 */
export const SESSION_TOUCH_INTERVAL_MS = 60_000;

const PgStore = connectPgSimple(session);

/**
 * Reads a live session row (`expire` not passed) and, in the same query, the principal of the
 * ids inside it: every signed-in request then costs one query for both. `principal` is null when
 * the session names no one or the membership is no longer active. Given by the auth module
 * (this layer sits below it).
 */
export type SessionReader = (pool: pg.Pool, sid: string, nowSeconds: number) => Promise<{ sess: session.SessionData; principal: Principal | null } | null>;

/** What the store read with the session: whose principal it is, so a later change of ids is noticed. */
type LoadedPrincipal = { userId: string | undefined; orgId: string | undefined; principal: Principal | null };
const LOADED = Symbol('principal read with the session');
type WithLoaded = { [LOADED]?: LoadedPrincipal };
/** From `get` to `createSession`, beside the session object (a property deleted from it again would slow it down). */
const loadedWith = new WeakMap<object, LoadedPrincipal>();

/**
 * The principal read together with this request's session, when it belongs to the ids the session
 * holds now; undefined when it was not read (no reader, a new session, other ids): ask for it then.
 */
export function principalReadWithSession(req: Request): Principal | null | undefined {
  const loaded = (req as WithLoaded)[LOADED];
  const s = req.session;
  if (!loaded || !s || loaded.userId !== s.userId || loaded.orgId !== s.orgId) return undefined;
  return loaded.principal;
}

/**
 * connect-pg-simple, writing a session's expiry at most once per interval: skipped outright when
 * this instance wrote the row within the interval, and otherwise written only when the stored
 * expiry is an interval or more behind (another instance may just have written it).
 */
export class ThrottledPgStore extends PgStore {
  private readonly written = new Map<string, number>();
  private readonly table: string;
  private readonly pg: pg.Pool;
  private readonly sweep: NodeJS.Timeout;
  private readonly prune: NodeJS.Timeout | null;
  private readonly readSession: SessionReader | undefined;
  private readonly renewCookie: ((sess: session.Session) => void) | undefined;

  constructor(options: {
    pool: pg.Pool;
    tableName: string;
    pruneSessionInterval: number | false;
    readSession?: SessionReader;
    /** Called when the stored expiry is pushed forward, before the answer's headers go out: re-send the cookie then. */
    renewCookie?: (sess: session.Session) => void;
  }) {
    // connect-pg-simple starts pruning only after its own get/set/destroy/touch; `get` and `touch`
    // are ours, so an instance that only serves signed-in requests would never prune: prune here.
    super({ pool: options.pool, tableName: options.tableName, pruneSessionInterval: false, createTableIfMissing: false });
    this.pg = options.pool;
    this.table = `"${options.tableName}"`;
    this.readSession = options.readSession;
    this.renewCookie = options.renewCookie;
    this.prune = options.pruneSessionInterval ? setInterval(() => this.pruneSessions(), options.pruneSessionInterval * 1000) : null;
    this.prune?.unref();
    // Forget what is older than the interval, so the map holds only recently active sessions.
    this.sweep = setInterval(() => {
      const cutoff = Date.now() - SESSION_TOUCH_INTERVAL_MS;
      for (const [sid, at] of this.written) if (at <= cutoff) this.written.delete(sid);
    }, SESSION_TOUCH_INTERVAL_MS);
    this.sweep.unref();
  }

  override get(sid: string, fn: (err: unknown, sess?: session.SessionData | null) => void): void {
    if (!this.readSession) return super.get(sid, fn);
    // connect-pg-simple compares with the time rounded up to the second; so does this.
    this.readSession(this.pg, sid, Math.ceil(Date.now() / 1000)).then(
      (row) => {
        if (!row) return fn(null, null);
        const sess = row.sess;
        loadedWith.set(sess, { userId: sess.userId, orgId: sess.orgId, principal: row.principal });
        fn(null, sess);
      },
      (err: unknown) => fn(err),
    );
  }

  /** Moves what `get` read beside the session onto the request (a symbol: never stored, never hashed). */
  override createSession(req: Request, sess: session.SessionData): session.Session & session.SessionData {
    const loaded = loadedWith.get(sess);
    const created = super.createSession(req, sess);
    if (loaded) (req as WithLoaded)[LOADED] = loaded;
    return created;
  }

  override set(sid: string, sess: session.SessionData, fn?: (err?: unknown) => void): void {
    this.written.set(sid, Date.now());
    super.set(sid, sess, fn);
  }

  override destroy(sid: string, fn?: (err?: unknown) => void): void {
    this.written.delete(sid);
    super.destroy(sid, fn);
  }

  override touch(sid: string, sess: session.SessionData, fn?: (err?: unknown) => void): void {
    const now = Date.now();
    const last = this.written.get(sid);
    if (last !== undefined && now - last < SESSION_TOUCH_INTERVAL_MS) return fn?.();
    this.written.set(sid, now);
    this.renewCookie?.(sess as session.Session);
    const expires = sess.cookie?.expires ? new Date(sess.cookie.expires).getTime() : now + (sess.cookie?.maxAge ?? 0);
    this.pg
      .query(`update ${this.table} set expire = to_timestamp($1) where sid = $2 and expire < to_timestamp($1) - make_interval(secs => $3)`, [
        Math.ceil(expires / 1000),
        sid,
        SESSION_TOUCH_INTERVAL_MS / 1000,
      ])
      .then(
        () => fn?.(),
        (err: unknown) => {
          this.written.delete(sid);
          fn?.(err);
        },
      );
  }

  override close(): void {
    clearInterval(this.sweep);
    if (this.prune) clearInterval(this.prune);
    super.close();
  }
}

/**
 * The session cookie again, with the expiry express-session has just moved to a full idle period
 * from now: the value express-session would set (`s:` + the id signed by cookie-signature, the
 * package express-session signs with) and the session's own cookie attributes. A Secure cookie is
 * not sent over plain HTTP, as express-session does not.
 */
function cookieRenewer(secret: string): (sess: session.Session) => void {
  return (sess) => {
    // express-session's Session keeps its request (non-enumerable); touch() is called with it.
    const req = (sess as session.Session & { req?: Request }).req;
    const res = req?.res;
    if (!req || !res || res.headersSent) return;
    const c = sess.cookie;
    if (c.secure && !req.secure) return;
    res.cookie(SESSION_COOKIE, `s:${sign(req.sessionID, secret)}`, {
      path: c.path,
      domain: c.domain,
      expires: c.expires ?? undefined,
      httpOnly: c.httpOnly,
      secure: c.secure === true,
      sameSite: c.sameSite,
    });
  };
}

/** Sessions live in PostgreSQL so several instances behind a load balancer share them. */
export function createSessionMiddleware(config: Config, pool: pg.Pool, readSession?: SessionReader): RequestHandler {
  return session({
    name: SESSION_COOKIE,
    store: new ThrottledPgStore({ pool, tableName: 'session', pruneSessionInterval: 15 * 60, readSession, renewCookie: cookieRenewer(config.SESSION_SECRET) }),
    secret: config.SESSION_SECRET,
    resave: false,
    saveUninitialized: false,
    // Idle timeout: the cookie is renewed together with the stored expiry, at most once a minute
    // (renewCookie above), not on every answer: signing and sending it each time cost every request.
    // express-session still sets it whenever the session is new or changed.
    rolling: false,
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
