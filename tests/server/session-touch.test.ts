import { describe, it, expect, beforeAll, afterAll, afterEach } from 'vitest';
import { makeShop, makeTestApp, sessionId, signIn, type TestShop } from '../setup/test-app';
import { SESSION_COOKIE, SESSION_TOUCH_INTERVAL_MS } from '../../server/http/session';

// Sessions: the stored expiry follows activity at most once a minute, and the idle timeout holds.
let t: Awaited<ReturnType<typeof makeTestApp>>;
let shop: TestShop;
const realNow = Date.now;
let offsetMs = 0;

beforeAll(async () => {
  t = await makeTestApp({ SESSION_IDLE_MINUTES: '5' });
  shop = await makeShop(t.em(), 'session');
  // Session code reads Date.now (express-session, connect-pg-simple); move it forward by hand.
  Date.now = () => realNow() + offsetMs;
});
afterEach(() => {
  offsetMs = 0;
});
afterAll(async () => {
  Date.now = realNow;
  await t.close();
});

const sessionCookieOf = (res: { headers: Record<string, unknown> }) =>
  ([] as string[]).concat((res.headers['set-cookie'] as string[] | undefined) ?? []).find((c) => c.startsWith(`${SESSION_COOKIE}=`));

async function storedExpiry(sid: string): Promise<number> {
  const rows: { expire: Date }[] = await t.em().getConnection().execute(`select expire from session where sid = ?`, [sid]);
  expect(rows).toHaveLength(1);
  return new Date(rows[0].expire).getTime();
}

describe('session expiry', () => {
  it('writes the session row at most once a minute while the person keeps working', async () => {
    const { agent } = await signIn(t.app, shop.users.technician.email);
    const sid = await sessionId(agent);
    const atSignIn = await storedExpiry(sid);

    for (let i = 0; i < 5; i++) await agent.get('/api/me').expect(200);
    offsetMs = SESSION_TOUCH_INTERVAL_MS - 5_000;
    await agent.get('/api/me').expect(200);
    expect(await storedExpiry(sid)).toBe(atSignIn);

    offsetMs = SESSION_TOUCH_INTERVAL_MS + 5_000;
    await agent.get('/api/me').expect(200);
    const touched = await storedExpiry(sid);
    // Pushed forward by the time that passed, to a full idle period from now (stored to the second).
    expect(touched - atSignIn).toBeGreaterThanOrEqual(SESSION_TOUCH_INTERVAL_MS);
    expect(Math.abs(touched - (Date.now() + 5 * 60_000))).toBeLessThan(2_000);

    await agent.get('/api/me').expect(200);
    expect(await storedExpiry(sid)).toBe(touched);
  });

  it('re-sends the cookie with a full idle period when the stored expiry moves, and not on every answer', async () => {
    const { agent } = await signIn(t.app, shop.users.admin.email);
    const sid = await sessionId(agent);
    const quiet = await agent.get('/api/me').expect(200);
    expect(sessionCookieOf(quiet)).toBeUndefined();

    offsetMs = SESSION_TOUCH_INTERVAL_MS + 5_000;
    const renewing = await agent.get('/api/me').expect(200);
    const cookie = sessionCookieOf(renewing);
    expect(cookie).toBeDefined();
    // The same signed session id, with the attributes it was first sent with (plain HTTP: no Secure).
    expect(decodeURIComponent(cookie!.split(';')[0])).toMatch(new RegExp(`^${SESSION_COOKIE}=s:${sid}\\.[A-Za-z0-9+/]+$`));
    expect(cookie).toMatch(/; Path=\//);
    expect(cookie).toMatch(/; HttpOnly/);
    expect(cookie).toMatch(/; SameSite=Lax/);
    expect(cookie).not.toMatch(/Secure/);
    const expires = Date.parse(/; Expires=([^;]+)/.exec(cookie!)![1]);
    expect(Math.abs(expires - (Date.now() + 5 * 60_000))).toBeLessThan(2_000);
    expect(Math.abs(expires - (await storedExpiry(sid)))).toBeLessThan(2_000);

    // The renewed cookie is accepted, and the next answer within the minute sends none again.
    const next = await agent.get('/api/me').expect(200);
    expect(sessionCookieOf(next)).toBeUndefined();
    expect(next.body.user.email).toBe(shop.users.admin.email);
  });

  it('keeps a working session alive past the idle period and ends an idle one after it', async () => {
    const { agent } = await signIn(t.app, shop.users.operator.email);
    // Active every 2 minutes for 8 minutes: longer than the 5-minute idle timeout.
    for (let minute = 2; minute <= 8; minute += 2) {
      offsetMs = minute * 60_000;
      await agent.get('/api/me').expect(200);
    }
    // Then idle for longer than the timeout.
    offsetMs = (8 + 5) * 60_000 + 5_000;
    await agent.get('/api/me').expect(401);
  });

  it('still answers 401 at once when the membership is deactivated', async () => {
    const { agent } = await signIn(t.app, shop.users.safety.email);
    await agent.get('/api/me').expect(200);
    await t.em().getConnection().execute(`update membership set active = false where id = ?`, [shop.users.safety.membershipId]);
    await agent.get('/api/me').expect(401);
  });
});
