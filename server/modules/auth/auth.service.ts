import type { EntityManager } from '@mikro-orm/postgresql';
import type pg from 'pg';
import type { SessionData } from 'express-session';
import { Membership, User, UserToken } from '../users/user.entity';
import { Organization } from '../organizations/organization.entity';
import { hashPassword, hashToken, newToken, verifyPassword } from './passwords';
import { badRequest, unauthorized } from '../../http/errors';
import { recordActivity } from '../activity-log/activity-log.service';
import { queueMail } from '../../mail/outbox';
import { renderMail } from '../../mail/templates';
import type { Principal } from '../../http/principal';
import { clock } from '../../../shared/clock';
import { shopLocale } from '../../../shared/locale';

const noScope = { filters: false } as const;

export const INVITE_TTL_MS = 7 * 24 * 3600_000;
export const RESET_TTL_MS = 60 * 60_000;

type PrincipalRow = { role: Principal['role']; name: string; email: string; org_name: string; time_zone: string };

const principalOf = (userId: string, orgId: string, r: PrincipalRow): Principal => ({
  userId,
  orgId,
  role: r.role,
  name: r.name,
  email: r.email,
  orgName: r.org_name,
  timeZone: r.time_zone,
  locale: shopLocale(),
});

// The two queries below are named (prepared once per connection): planning these joins cost
// PostgreSQL ten times their execution, on every request.

/**
 * The active membership that a session's user acts through, or null. Asked when the session was
 * not read with its principal (see readSessionWithPrincipal): one query on the (user, organization)
 * unique index, joined to the two primary keys, sent through the session pool without the ORM.
 */
export async function loadPrincipal(pool: pg.Pool, userId: string, orgId: string): Promise<Principal | null> {
  const { rows } = await pool.query<PrincipalRow>({
    name: 'principal',
    text: `select m.role, u.name, u.email, o.name as org_name, o.time_zone
             from membership m join app_user u on u.id = m.user_id join organization o on o.id = m.organization_id
            where m.user_id = $1 and m.organization_id = $2 and m.active`,
    values: [userId, orgId],
  });
  return rows[0] ? principalOf(userId, orgId, rows[0]) : null;
}

type SessionRow = { sess: SessionData } & { [K in keyof PrincipalRow]: PrincipalRow[K] | null };

/**
 * A live session row and the principal of the ids inside it, in one query: the session's primary
 * key, then the same (user, organization) unique index and primary keys as loadPrincipal. Every
 * signed-in request reads its session through this (the session store's `get`). `expire` is
 * compared as connect-pg-simple does; the principal is null for a session of no one (before sign-in)
 * and for a membership no longer active.
 */
export async function readSessionWithPrincipal(
  pool: pg.Pool,
  sid: string,
  nowSeconds: number,
): Promise<{ sess: SessionData; principal: Principal | null } | null> {
  const { rows } = await pool.query<SessionRow>({
    name: 'session-with-principal',
    text: `select s.sess, m.role, u.name, u.email, o.name as org_name, o.time_zone
             from session s
             left join membership m on m.user_id = (s.sess->>'userId')::uuid and m.organization_id = (s.sess->>'orgId')::uuid and m.active
             left join app_user u on u.id = m.user_id
             left join organization o on o.id = m.organization_id
            where s.sid = $1 and s.expire >= to_timestamp($2)`,
    values: [sid, nowSeconds],
  });
  const r = rows[0];
  if (!r) return null;
  const { userId, orgId } = r.sess;
  const principal = r.role && userId && orgId ? principalOf(userId, orgId, r as PrincipalRow & { sess: SessionData }) : null;
  return { sess: r.sess, principal };
}

export async function authenticate(em: EntityManager, email: string, password: string): Promise<Principal> {
  const user = await em.findOne(User, { email }, noScope);
  const ok = await verifyPassword(user?.passwordHash, password);
  if (!user || !ok) throw unauthorized('E-mail or password is wrong');
  const membership = await em.findOne(Membership, { user, active: true }, { orderBy: { createdAt: 'asc' }, populate: ['organization'], ...noScope });
  if (!membership) throw unauthorized('This account is deactivated. Ask your admin.');
  const org = await em.findOneOrFail(Organization, membership.organization.id, noScope);
  user.lastSignInAt = clock.now();
  recordActivity(em, { orgId: membership.organization.id, userId: user.id }, 'auth.sign-in', { type: 'User', id: user.id });
  await em.flush();
  return {
    userId: user.id,
    orgId: org.id,
    role: membership.role,
    name: user.name,
    email: user.email,
    orgName: org.name,
    timeZone: org.timeZone,
    locale: shopLocale(),
  };
}

/** Creates a single-use token and returns the raw value (only its hash is stored). */
export function issueToken(em: EntityManager, userId: string, purpose: 'invite' | 'reset'): string {
  const token = newToken();
  em.create(UserToken, {
    user: userId,
    purpose,
    tokenHash: hashToken(token),
    expiresAt: new Date(clock.ms() + (purpose === 'invite' ? INVITE_TTL_MS : RESET_TTL_MS)),
  });
  return token;
}

/**
 * How long every password-reset request takes to answer. Far above the work either path does
 * (lookups, or lookups plus a token and a queued mail, even on a busy machine), so the answer's
 * timing says nothing about whether the account exists.
 */
export const RESET_ANSWER_MS = 1000;

export async function requestPasswordReset(em: EntityManager, email: string, appUrl: string): Promise<void> {
  const started = performance.now();
  try {
    await issueReset(em, email, appUrl);
  } finally {
    const left = RESET_ANSWER_MS - (performance.now() - started);
    if (left > 0) await new Promise((resolve) => setTimeout(resolve, left));
  }
}

async function issueReset(em: EntityManager, email: string, appUrl: string): Promise<void> {
  const user = await em.findOne(User, { email }, noScope);
  if (!user) return; // same answer either way: no account enumeration
  const membership = await em.findOne(Membership, { user, active: true }, noScope);
  if (!membership) return;
  const token = issueToken(em, user.id, 'reset');
  const url = `${appUrl}/reset-password?token=${token}`;
  queueMail(em, {
    to: user.email,
    kind: 'password-reset',
    organizationId: membership.organization.id,
    subject: 'Reset your Kerfbook password',
    ...renderMail({
      heading: 'Reset your password',
      paragraphs: [
        `Hello ${user.name},`,
        'Someone asked to reset the password of your Kerfbook account. The link works once, for one hour. If it was not you, ignore this mail.',
      ],
      action: { label: 'Choose a new password', url },
    }),
  });
  await em.flush();
}

/**
 * Signs the user out everywhere: after a new password, whoever held a session with the old one
 * (a shared tablet, someone who learnt it) must not stay signed in. Sessions are rows of the
 * `session` table (connect-pg-simple); inside the caller's transaction, so it holds or fails with
 * the password change. Call it from every place that sets a password.
 */
export async function endAllSessions(em: EntityManager, userId: string): Promise<void> {
  await em.execute(`delete from session where sess->>'userId' = ?`, [userId]);
}

/** Sets a password through an invitation or reset link; the link is spent either way it succeeds. */
export async function redeemToken(em: EntityManager, token: string, password: string): Promise<{ email: string }> {
  return em.transactional(async (tx) => {
    const row = await tx.findOne(UserToken, { tokenHash: hashToken(token) }, noScope);
    if (!row) throw badRequest('This link is not valid. Ask for a new one.', [{ path: 'token', message: 'Link not valid' }]);
    if (row.usedAt)
      throw badRequest('This link was already used, or a newer one replaced it. Ask for a new one.', [{ path: 'token', message: 'Link already used' }]);
    if (row.expiresAt.getTime() < clock.ms()) throw badRequest('This link has expired. Ask for a new one.', [{ path: 'token', message: 'Link expired' }]);
    const user = await tx.findOneOrFail(User, row.user.id, noScope);
    user.passwordHash = await hashPassword(password);
    row.usedAt = clock.now();
    // Other links mailed earlier could set the password again: spend them with this one.
    await tx.nativeUpdate(UserToken, { user: user.id, usedAt: null, id: { $ne: row.id } }, { usedAt: clock.now() }, noScope);
    await endAllSessions(tx, user.id);
    const membership = await tx.findOne(Membership, { user }, noScope);
    if (membership)
      recordActivity(tx, { orgId: membership.organization.id, userId: user.id }, row.purpose === 'invite' ? 'auth.invite-accepted' : 'auth.password-reset', {
        type: 'User',
        id: user.id,
      });
    return { email: user.email };
  });
}
