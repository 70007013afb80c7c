import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { anonymous, get, makeShop, makeTestApp, post, signIn, type TestShop } from '../setup/test-app';
import { OutboxMail } from '../../server/mail/outbox.entity';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let shop: TestShop;

beforeAll(async () => {
  t = await makeTestApp();
  shop = await makeShop(t.em(), 'pw-sessions');
});
afterAll(() => t.close());

const resetLinks = async (email: string) =>
  (await t.em().find(OutboxMail, { toAddress: email, kind: 'password-reset' }, { orderBy: { createdAt: 'asc' } })).map(
    (m) => /token=([A-Za-z0-9_-]+)/.exec(m.textBody)![1],
  );

describe('a new password ends every session of its account', () => {
  it('signs out every browser of the person on a password reset, and spends their other reset links', async () => {
    const email = shop.users.technician.email;
    const tablet = await signIn(t.app, email);
    const desktop = await signIn(t.app, email);
    const colleague = await signIn(t.app, shop.users.operator.email);
    await get(tablet, '/me').expect(200);
    await get(desktop, '/me').expect(200);

    const anon = await anonymous(t.app);
    await post(anon, '/auth/request-reset', { email }).expect(200);
    await post(anon, '/auth/request-reset', { email }).expect(200);
    const [first, second] = await resetLinks(email);
    await post(anon, '/auth/redeem', { token: second, password: 'a fresh long passphrase', confirm: 'a fresh long passphrase' }).expect(200);

    // Whoever held a session (perhaps the person who knew the old password) is out.
    await get(tablet, '/me').expect(401);
    await get(desktop, '/me').expect(401);
    await get(colleague, '/me').expect(200);
    // The other link mailed before cannot set the password again.
    const reuse = await post(anon, '/auth/redeem', { token: first, password: 'someone elses passphrase', confirm: 'someone elses passphrase' }).expect(400);
    expect(reuse.body.fields).toEqual([{ path: 'token', message: 'Link already used' }]);
    await signIn(t.app, email, 'a fresh long passphrase');
  });
});
