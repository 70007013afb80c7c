import { rateLimit, ipKeyGenerator } from 'express-rate-limit';
import type { ApiRouter } from '../../http/route';
import { route } from '../../http/route';
import { requestEm } from '../../db';
import { loginSchema, requestResetSchema, tokenPasswordSchema } from '../../../shared/schemas/auth';
import { authenticate, redeemToken, requestPasswordReset } from './auth.service';
import { destroy, ensureCsrfToken, regenerate, save, SESSION_COOKIE } from '../../http/session';
import type { Config } from '../../config';
import { recordActivity } from '../activity-log/activity-log.service';
import type { ApiErrorBody } from '../../../shared/schemas/common';
import type { EntityManager } from '@mikro-orm/postgresql';

function tooMany(message: string) {
  const body: ApiErrorBody = { error: 'rate_limited', message };
  return body;
}

export function registerAuthRoutes(r: ApiRouter, config: Config) {
  // A shop's tablets often share one address, and a shift change signs many people in at
  // once, so only failed attempts count here too.
  const perAddress = rateLimit({
    windowMs: 15 * 60_000,
    limit: config.LOGIN_LIMIT_PER_ADDRESS,
    skipSuccessfulRequests: true,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    keyGenerator: (req) => ipKeyGenerator(req.ip ?? 'unknown'),
    message: tooMany('Too many sign-in attempts from this address. Wait 15 minutes and try again.'),
  });
  // Only failures count against an account, so a user who signs in often is not locked out.
  const perAccount = rateLimit({
    windowMs: 15 * 60_000,
    limit: config.LOGIN_LIMIT_PER_ACCOUNT,
    skipSuccessfulRequests: true,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    keyGenerator: (req) =>
      `acct:${String(req.body?.email ?? '')
        .trim()
        .toLowerCase()}`,
    message: tooMany('Too many failed sign-ins for this account. Wait 15 minutes or reset the password.'),
  });

  route(r, 'get', '/auth/csrf', { access: 'public' }, async (req, res) => {
    const token = ensureCsrfToken(req);
    await save(req);
    res.json({ token });
  });

  route(r, 'post', '/auth/login', { access: 'public', body: loginSchema, before: [perAddress, perAccount] }, async (req, res, { body }) => {
    const { email, password } = body;
    const principal = await authenticate(requestEm() as EntityManager, email, password);
    // New session id at sign-in (no fixation) and a new CSRF token with it.
    await regenerate(req);
    req.session.userId = principal.userId;
    req.session.orgId = principal.orgId;
    req.session.signedInAt = Date.now();
    const csrfToken = ensureCsrfToken(req);
    await save(req);
    res.json({ ok: true, csrfToken, role: principal.role });
  });

  route(r, 'post', '/auth/logout', { access: 'public' }, async (req, res, { principal }) => {
    if (principal) {
      const em = requestEm() as EntityManager;
      recordActivity(em, principal, 'auth.sign-out', { type: 'User', id: principal.userId });
      await em.flush();
    }
    await destroy(req);
    res.clearCookie(SESSION_COOKIE);
    res.json({ ok: true });
  });

  route(r, 'post', '/auth/request-reset', { access: 'public', body: requestResetSchema, before: [perAddress] }, async (_req, res, { body }) => {
    await requestPasswordReset(requestEm() as EntityManager, body.email, config.APP_URL);
    res.json({ ok: true, message: 'If that address has an account, a reset link is on its way.' });
  });

  route(r, 'post', '/auth/redeem', { access: 'public', body: tokenPasswordSchema, before: [perAddress] }, async (_req, res, { body }) => {
    const { email } = await redeemToken(requestEm() as EntityManager, body.token, body.password);
    res.json({ ok: true, email });
  });

  route(r, 'get', '/me', { access: 'signed-in' }, async (_req, res, { principal: p }) => {
    res.json({
      user: { id: p.userId, email: p.email, name: p.name },
      role: p.role,
      organization: { id: p.orgId, name: p.orgName, timeZone: p.timeZone, locale: p.locale },
    });
  });
}
