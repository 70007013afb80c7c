import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import type { MikroORM } from '@mikro-orm/postgresql';
import { anonymous, get, makeShop, makeTestApp, post, signIn, type TestShop } from '../setup/test-app';
import { initORM } from '../../server/db';
import { FakeSmtp } from '../../server/mail/fake-smtp';
import { createTransport } from '../../server/mail/transport';
import { deliverOutbox } from '../../server/mail/sender';
import { createApp } from '../../server/app';
import { loadConfig } from '../../server/config';
import type { CapturedMail } from '../../server/mail/fake-smtp';

const PORT = 26_000 + Math.floor(Math.random() * 1000);
let orm: MikroORM;
let smtp: FakeSmtp;
let t: Awaited<ReturnType<typeof makeTestApp>>;
let shopA: TestShop;
let shopB: TestShop;

beforeAll(async () => {
  smtp = new FakeSmtp(PORT);
  await smtp.start();
  t = await makeTestApp({ MAIL_CAPTURE: 'true', SMTP_PORT: String(PORT) }, smtp);
  orm = await initORM();
  // Start from an empty queue so only this file's mail reaches this capture.
  await orm.em.getConnection().execute(`update outbox_mail set status = 'sent' where status = 'pending'`);
  shopA = await makeShop(t.em(), 'inbox-a');
  shopB = await makeShop(t.em(), 'inbox-b');
});
afterAll(async () => {
  await smtp.stop();
  await t.close();
});

const deliver = () => deliverOutbox(orm, createTransport(t.config), t.config.MAIL_FROM);
const inboxOf = async (email: string): Promise<CapturedMail[]> => {
  const res = await get(await signIn(t.app, email), '/dev/inbox').expect(200);
  return res.body.mails;
};
const addressedTo = (mails: CapturedMail[], email: string) => mails.filter((m) => m.to.includes(email));

describe('dev inbox', () => {
  it("never shows one shop's mail to another shop, and a reset link only to its owner", async () => {
    // Someone asks for a reset of shop A's safety officer; an admin of shop B invites a person.
    const stranger = await anonymous(t.app);
    await post(stranger, '/auth/request-reset', { email: shopA.users.safety.email }).expect(200);
    const adminB = await signIn(t.app, shopB.users.admin.email);
    const inviteeB = `newcomer@${shopB.slug}.example`;
    await post(adminB, '/users', { name: 'New Comer', email: inviteeB, role: 'operator' }).expect(201);
    const adminA = await signIn(t.app, shopA.users.admin.email);
    const inviteeA = `joiner@${shopA.slug}.example`;
    await post(adminA, '/users', { name: 'Join Er', email: inviteeA, role: 'technician' }).expect(201);
    expect((await deliver()).sent).toBe(3);
    expect(smtp.mails.filter((m) => [shopA.users.safety.email, inviteeA, inviteeB].some((a) => m.to.includes(a)))).toHaveLength(3);

    // Shop B's admin sees the invitation of shop B only: not shop A's reset link nor its invitation.
    const seenByAdminB = await inboxOf(shopB.users.admin.email);
    expect(addressedTo(seenByAdminB, inviteeB)).toHaveLength(1);
    expect(addressedTo(seenByAdminB, shopA.users.safety.email)).toHaveLength(0);
    expect(addressedTo(seenByAdminB, inviteeA)).toHaveLength(0);

    // Shop A's admin sees the shop's invitation, but not the reset link of a colleague.
    const seenByAdminA = await inboxOf(shopA.users.admin.email);
    expect(addressedTo(seenByAdminA, inviteeA)).toHaveLength(1);
    expect(addressedTo(seenByAdminA, shopA.users.safety.email)).toHaveLength(0);
    expect(addressedTo(seenByAdminA, inviteeB)).toHaveLength(0);

    // The safety officer reads their own reset mail, and nobody else's.
    const seenBySafety = await inboxOf(shopA.users.safety.email);
    expect(addressedTo(seenBySafety, shopA.users.safety.email)).toHaveLength(1);
    expect(seenBySafety.every((m) => m.to.includes(shopA.users.safety.email))).toBe(true);
  });

  it('is off in production', async () => {
    const production = {
      ...process.env,
      NODE_ENV: 'production',
      SESSION_SECRET: 'a-long-production-secret-for-tests',
      MIGRATION_DATABASE_URL: 'postgres://owner@127.0.0.1/kerfbook',
    };
    expect(() => loadConfig({ ...production, MAIL_CAPTURE: 'true' })).toThrow(/MAIL_CAPTURE/);
    expect(loadConfig(production).MAIL_CAPTURE).toBe(false);
    // Even if a configuration object says otherwise, a production app serves no inbox.
    const handle = createApp({ orm, config: { ...loadConfig(production), MAIL_CAPTURE: true }, smtp });
    try {
      const me = await signIn(handle.app, shopA.users.admin.email);
      await get(me, '/dev/inbox').expect(404);
    } finally {
      await handle.close();
    }
  });
});
