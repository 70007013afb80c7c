import type { EntityManager } from '@mikro-orm/postgresql';
import { Membership, User, UserToken } from './user.entity';
import { Organization } from '../organizations/organization.entity';
import type { Principal } from '../../http/principal';
import type { InviteUserInput, ListUsersQuery, MemberRow, UpdateMemberInput } from '../../../shared/schemas/users';
import { conflict, fieldError, notFound } from '../../http/errors';
import { issueToken } from '../auth/auth.service';
import { queueMail } from '../../mail/outbox';
import { renderMail } from '../../mail/templates';
import { recordActivity } from '../activity-log/activity-log.service';
import { ROLE_LABELS } from '../../../shared/permissions';
import { clock } from '../../../shared/clock';
import type { Page } from '../../../shared/schemas/paging';

// Memberships are the shop-scoped rows here; users are global (one person, one e-mail).
type MemberSql = {
  membership_id: string;
  user_id: string;
  name: string;
  email: string;
  role: MemberRow['role'];
  status: MemberRow['status'];
  last_sign_in_at: Date | null;
  total: string;
};

const statusSql = `case when not m.active then 'deactivated' when u.password_hash is null then 'invited' else 'active' end`;
const sortSql: Record<ListUsersQuery['sort'], string> = {
  name: 'u.name',
  email: 'u.email',
  role: 'm.role',
  status: statusSql,
  lastSignInAt: 'u.last_sign_in_at',
};

export async function listMembers(em: EntityManager, who: Principal, q: ListUsersQuery): Promise<Page<MemberRow>> {
  const params: unknown[] = [who.orgId];
  let where = 'm.organization_id = ?';
  if (q.q) {
    where += ' and (u.name ilike ? or u.email ilike ?)';
    params.push(`%${q.q}%`, `%${q.q}%`);
  }
  if (q.role) {
    where += ' and m.role = ?';
    params.push(q.role);
  }
  if (q.status) {
    where += ` and ${statusSql} = ?`;
    params.push(q.status);
  }
  const rows: MemberSql[] = await em.getConnection().execute(
    `select m.id as membership_id, u.id as user_id, u.name, u.email, m.role, ${statusSql} as status, u.last_sign_in_at, count(*) over () as total
       from membership m join app_user u on u.id = m.user_id
      where ${where}
      order by ${sortSql[q.sort]} ${q.dir === 'desc' ? 'desc' : 'asc'} nulls last, u.email
      limit ? offset ?`,
    [...params, q.pageSize, (q.page - 1) * q.pageSize],
  );
  return {
    rows: rows.map((r) => ({
      membershipId: r.membership_id,
      userId: r.user_id,
      name: r.name,
      email: r.email,
      role: r.role,
      status: r.status,
      lastSignInAt: r.last_sign_in_at ? new Date(r.last_sign_in_at).toISOString() : null,
    })),
    total: rows[0] ? Number(rows[0].total) : 0,
    page: q.page,
    pageSize: q.pageSize,
  };
}

function queueInvitation(
  em: EntityManager,
  who: Principal,
  to: { email: string; name: string; role: MemberRow['role'] },
  shopName: string,
  token: string,
  appUrl: string,
) {
  queueMail(em, {
    to: to.email,
    kind: 'invitation',
    organizationId: who.orgId,
    subject: `You are invited to ${shopName} on Kerfbook`,
    ...renderMail({
      heading: `Join ${shopName} on Kerfbook`,
      paragraphs: [`Hello ${to.name},`, `${who.name} invited you as ${ROLE_LABELS[to.role]}. Choose a password to start. The link works once, for seven days.`],
      action: { label: 'Accept the invitation', url: `${appUrl}/accept-invite?token=${token}` },
    }),
  });
}

export async function inviteMember(em: EntityManager, who: Principal, input: InviteUserInput, appUrl: string): Promise<{ membershipId: string }> {
  return em.transactional(async (tx) => {
    let user = await tx.findOne(User, { email: input.email }, { filters: false });
    if (user) {
      const existing = await tx.findOne(Membership, { user, organization: who.orgId }, { filters: false });
      if (existing) throw conflict('This person is already a member of your shop', [{ path: 'email', message: 'Already a member' }]);
      // Whether the address is known elsewhere is no business of this shop: say only that it cannot be used.
      throw conflict('This address cannot be invited. Ask the person for another e-mail address.', [
        { path: 'email', message: 'This address cannot be invited' },
      ]);
    }
    user = tx.create(User, { email: input.email, name: input.name });
    const membership = tx.create(Membership, { user, organization: who.orgId, role: input.role });
    const org = await tx.findOneOrFail(Organization, who.orgId);
    const token = issueToken(tx, user.id, 'invite');
    queueInvitation(tx, who, { email: user.email, name: input.name, role: input.role }, org.name, token, appUrl);
    recordActivity(tx, who, 'user.invited', { type: 'Membership', id: membership.id }, { email: input.email, role: input.role });
    return { membershipId: membership.id };
  });
}

export async function updateMember(em: EntityManager, who: Principal, membershipId: string, input: UpdateMemberInput): Promise<void> {
  await em.transactional(async (tx) => {
    const m = await tx.findOne(Membership, { id: membershipId, organization: who.orgId }, { filters: false });
    if (!m) throw notFound('Member');
    if (m.user.id === who.userId) {
      if (input.active === false) throw fieldError('active', 'You cannot deactivate yourself');
      if (input.role && input.role !== m.role) throw fieldError('role', 'You cannot change your own role');
    }
    const before = { role: m.role, active: m.active };
    if (input.role) m.role = input.role;
    if (input.active !== undefined) m.active = input.active;
    if (before.role === 'admin' && (m.role !== 'admin' || !m.active)) {
      const admins = await tx.count(Membership, { organization: who.orgId, role: 'admin', active: true, id: { $ne: m.id } }, { filters: false });
      if (admins === 0) throw conflict('The shop needs at least one active admin');
    }
    // A deactivated member's open links (invitation, password reset) stop working with it.
    if (before.active && !m.active) await tx.nativeUpdate(UserToken, { user: m.user.id, usedAt: null }, { usedAt: clock.now() });
    recordActivity(tx, who, 'user.updated', { type: 'Membership', id: m.id }, { before, after: { role: m.role, active: m.active } });
  });
}

/**
 * Sends a fresh invitation link to someone who has not accepted yet (the mail got lost, or the
 * seven days ran out). Earlier links stop working, so only the newest mail can be used.
 */
export async function resendInvitation(em: EntityManager, who: Principal, membershipId: string, appUrl: string): Promise<void> {
  await em.transactional(async (tx) => {
    const m = await tx.findOne(Membership, { id: membershipId, organization: who.orgId }, { filters: false, populate: ['user'] });
    if (!m) throw notFound('Member');
    const user = m.user.getEntity();
    if (user.passwordHash) throw conflict(`${user.name} has already accepted the invitation and signs in with a password`);
    if (!m.active) throw conflict(`${user.name}'s membership is deactivated; reactivate it first`);
    await tx.nativeUpdate(UserToken, { user: user.id, purpose: 'invite', usedAt: null }, { usedAt: clock.now() });
    const org = await tx.findOneOrFail(Organization, who.orgId);
    queueInvitation(tx, who, { email: user.email, name: user.name, role: m.role }, org.name, issueToken(tx, user.id, 'invite'), appUrl);
    recordActivity(tx, who, 'user.invitation-resent', { type: 'Membership', id: m.id }, { email: user.email });
  });
}
