import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { anonymous, makeShop, makeTestApp, signIn, type TestShop } from '../setup/test-app';
import { OutboxMail } from '../../server/mail/outbox.entity';
import { UserToken } from '../../server/modules/users/user.entity';
import { hashToken } from '../../server/modules/auth/passwords';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let shop: TestShop;

beforeAll(async () => {
  t = await makeTestApp();
  shop = await makeShop(t.em(), 'users');
});
afterAll(() => t.close());

const linkToken = (text: string) => /token=([A-Za-z0-9_-]+)/.exec(text)?.[1];

describe('user management', () => {
  it('invites by e-mail; the single-use link sets a password and the person can sign in', async () => {
    const admin = await signIn(t.app, shop.users.admin.email);
    const email = `new-hire@${shop.slug}.example`;
    await admin.agent.post('/api/users').set('X-CSRF-Token', admin.csrf).send({ name: 'New Hire', email, role: 'operator' }).expect(201);

    const mail = await t.em().findOneOrFail(OutboxMail, { toAddress: email, kind: 'invitation' });
    const token = linkToken(mail.textBody);
    expect(token).toBeTruthy();

    const list = await admin.agent.get(`/api/users?q=new-hire`).expect(200);
    expect(list.body.rows[0]).toMatchObject({ email, role: 'operator', status: 'invited' });

    const anon = await anonymous(t.app);
    await anon.agent
      .post('/api/auth/redeem')
      .set('X-CSRF-Token', anon.csrf)
      .send({ token, password: 'a long new passphrase', confirm: 'a long new passphrase' })
      .expect(200);
    const reuse = await anon.agent
      .post('/api/auth/redeem')
      .set('X-CSRF-Token', anon.csrf)
      .send({ token, password: 'another passphrase!', confirm: 'another passphrase!' })
      .expect(400);
    expect(reuse.body.message).toMatch(/already used/);

    await signIn(t.app, email, 'a long new passphrase');
  });

  it('resends an invitation with a new link; the old link stops working; someone who accepted gets none', async () => {
    const admin = await signIn(t.app, shop.users.admin.email);
    const email = `late-reader@${shop.slug}.example`;
    const created = await admin.agent.post('/api/users').set('X-CSRF-Token', admin.csrf).send({ name: 'Late Reader', email, role: 'technician' }).expect(201);
    const first = linkToken((await t.em().findOneOrFail(OutboxMail, { toAddress: email, kind: 'invitation' })).textBody);

    await admin.agent.post(`/api/users/${created.body.membershipId}/resend-invitation`).set('X-CSRF-Token', admin.csrf).expect(200);
    const mails = await t.em().find(OutboxMail, { toAddress: email, kind: 'invitation' }, { orderBy: { createdAt: 'asc' } });
    expect(mails).toHaveLength(2);
    const second = linkToken(mails[1].textBody);
    expect(second).toBeTruthy();
    expect(second).not.toBe(first);

    const anon = await anonymous(t.app);
    const old = await anon.agent
      .post('/api/auth/redeem')
      .set('X-CSRF-Token', anon.csrf)
      .send({ token: first, password: 'a long new passphrase', confirm: 'a long new passphrase' })
      .expect(400);
    expect(old.body.message).toMatch(/already used/);
    await anon.agent
      .post('/api/auth/redeem')
      .set('X-CSRF-Token', anon.csrf)
      .send({ token: second, password: 'a long new passphrase', confirm: 'a long new passphrase' })
      .expect(200);

    const again = await admin.agent.post(`/api/users/${created.body.membershipId}/resend-invitation`).set('X-CSRF-Token', admin.csrf).expect(409);
    expect(again.body.message).toMatch(/already accepted/);
    expect(await t.em().count(OutboxMail, { toAddress: email, kind: 'invitation' })).toBe(2);
  });

  it('withdrawing an invitation (deactivating before it is accepted) makes its link stop working', async () => {
    const admin = await signIn(t.app, shop.users.admin.email);
    const email = `changed-mind@${shop.slug}.example`;
    const created = await admin.agent.post('/api/users').set('X-CSRF-Token', admin.csrf).send({ name: 'Changed Mind', email, role: 'operator' }).expect(201);
    const token = linkToken((await t.em().findOneOrFail(OutboxMail, { toAddress: email, kind: 'invitation' })).textBody);
    await admin.agent.patch(`/api/users/${created.body.membershipId}`).set('X-CSRF-Token', admin.csrf).send({ active: false }).expect(200);
    const anon = await anonymous(t.app);
    const res = await anon.agent
      .post('/api/auth/redeem')
      .set('X-CSRF-Token', anon.csrf)
      .send({ token, password: 'a long new passphrase', confirm: 'a long new passphrase' })
      .expect(400);
    expect(res.body.message).toMatch(/already used/);
    const resend = await admin.agent.post(`/api/users/${created.body.membershipId}/resend-invitation`).set('X-CSRF-Token', admin.csrf).expect(409);
    expect(resend.body.message).toMatch(/deactivated/);
  });

  it('refuses a duplicate invitation with the error on the e-mail field', async () => {
    const admin = await signIn(t.app, shop.users.admin.email);
    const res = await admin.agent
      .post('/api/users')
      .set('X-CSRF-Token', admin.csrf)
      .send({ name: 'Again', email: shop.users.operator.email, role: 'operator' })
      .expect(409);
    expect(res.body.fields).toEqual([{ path: 'email', message: 'Already a member' }]);
  });

  it('changes a role and deactivates a member, whose session then ends', async () => {
    const admin = await signIn(t.app, shop.users.admin.email);
    const tech = await signIn(t.app, shop.users.technician.email);
    await admin.agent.patch(`/api/users/${shop.users.technician.membershipId}`).set('X-CSRF-Token', admin.csrf).send({ role: 'safety' }).expect(200);
    expect((await tech.agent.get('/api/me').expect(200)).body.role).toBe('safety');
    await admin.agent.patch(`/api/users/${shop.users.technician.membershipId}`).set('X-CSRF-Token', admin.csrf).send({ active: false }).expect(200);
    await tech.agent.get('/api/me').expect(401);
    const anon = await anonymous(t.app);
    const res = await anon.agent
      .post('/api/auth/login')
      .set('X-CSRF-Token', anon.csrf)
      .send({ email: shop.users.technician.email, password: 'kerfbook-demo' })
      .expect(401);
    expect(res.body.message).toMatch(/deactivated/);
  });

  it('does not let an admin deactivate themself', async () => {
    const admin = await signIn(t.app, shop.users.admin.email);
    const res = await admin.agent.patch(`/api/users/${shop.users.admin.membershipId}`).set('X-CSRF-Token', admin.csrf).send({ active: false }).expect(400);
    expect(res.body.fields).toEqual([{ path: 'active', message: 'You cannot deactivate yourself' }]);
  });

  it('password reset answers the same for unknown addresses and mails a link to known ones', async () => {
    const anon = await anonymous(t.app);
    const unknown = await anon.agent.post('/api/auth/request-reset').set('X-CSRF-Token', anon.csrf).send({ email: 'nobody@nowhere.example' }).expect(200);
    const known = await anon.agent.post('/api/auth/request-reset').set('X-CSRF-Token', anon.csrf).send({ email: shop.users.safety.email }).expect(200);
    expect(unknown.body).toEqual(known.body);
    const mail = await t.em().findOneOrFail(OutboxMail, { toAddress: shop.users.safety.email, kind: 'password-reset' });
    const token = linkToken(mail.textBody);
    await anon.agent
      .post('/api/auth/redeem')
      .set('X-CSRF-Token', anon.csrf)
      .send({ token, password: 'safety first passphrase', confirm: 'safety first passphrase' })
      .expect(200);
    await signIn(t.app, shop.users.safety.email, 'safety first passphrase');
  });

  it('refuses an expired link', async () => {
    const anon = await anonymous(t.app);
    await anon.agent.post('/api/auth/request-reset').set('X-CSRF-Token', anon.csrf).send({ email: shop.users.operator.email }).expect(200);
    const mail = await t.em().findOneOrFail(OutboxMail, { toAddress: shop.users.operator.email, kind: 'password-reset' });
    const token = linkToken(mail.textBody)!;
    await t.em().nativeUpdate(UserToken, { tokenHash: hashToken(token) }, { expiresAt: new Date(Date.now() - 1000) }, { filters: false });
    const res = await anon.agent
      .post('/api/auth/redeem')
      .set('X-CSRF-Token', anon.csrf)
      .send({ token, password: 'too late passphrase', confirm: 'too late passphrase' })
      .expect(400);
    expect(res.body.message).toMatch(/expired/);
    await signIn(t.app, shop.users.operator.email); // the old password still works
  });

  it('names mismatched and short passwords on their fields', async () => {
    const anon = await anonymous(t.app);
    const res = await anon.agent
      .post('/api/auth/redeem')
      .set('X-CSRF-Token', anon.csrf)
      .send({ token: 'x'.repeat(43), password: 'short', confirm: 'other' })
      .expect(400);
    expect(res.body.fields).toEqual(expect.arrayContaining([{ path: 'password', message: 'Use at least 12 characters' }]));
  });
});
