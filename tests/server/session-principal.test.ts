import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import pg from 'pg';
import { anonymous, makeShop, makeTestApp, sessionId, signIn, type TestShop } from '../setup/test-app';

import { readSessionWithPrincipal } from '../../server/modules/auth/auth.service';

// Every signed-in request reads its session row and the principal of the ids inside it in one query.
let t: Awaited<ReturnType<typeof makeTestApp>>;
let shop: TestShop;
let other: TestShop;
let pool: pg.Pool;
const nowSeconds = () => Math.ceil(Date.now() / 1000);

beforeAll(async () => {
  t = await makeTestApp();
  shop = await makeShop(t.em(), 'sess-principal');
  other = await makeShop(t.em(), 'sess-principal-other');
  pool = new pg.Pool({ connectionString: t.config.DATABASE_URL, max: 2 });
});
afterAll(async () => {
  await pool.end();
  await t.close();
});

describe('session and principal in one query', () => {
  it('returns the signed-in person with role and shop, none for a session before sign-in, nothing for an unknown or expired id', async () => {
    const { agent } = await signIn(t.app, shop.users.technician.email);
    const sid = await sessionId(agent);
    const read = await readSessionWithPrincipal(pool, sid, nowSeconds());
    expect(read?.sess.userId).toBe(shop.users.technician.userId);
    expect(read?.principal).toMatchObject({
      userId: shop.users.technician.userId,
      orgId: shop.orgId,
      role: 'technician',
      email: shop.users.technician.email,
      name: `technician of ${shop.slug}`,
      orgName: `Test ${shop.slug}`,
      timeZone: 'America/Chicago',
    });

    const anon = await anonymous(t.app);
    const anonRead = await readSessionWithPrincipal(pool, await sessionId(anon.agent), nowSeconds());
    expect(anonRead?.sess.csrfToken).toBeTruthy();
    expect(anonRead?.principal).toBeNull();

    expect(await readSessionWithPrincipal(pool, 'no-such-session', nowSeconds())).toBeNull();
    // Past the stored expiry the row is no session at all.
    expect(await readSessionWithPrincipal(pool, sid, nowSeconds() + 24 * 3600 * 365)).toBeNull();
  });

  it('follows the ids stored in the session: another shop without a membership, or a deactivated one, is nobody', async () => {
    const { agent } = await signIn(t.app, shop.users.admin.email);
    const sid = await sessionId(agent);
    await agent.get('/api/me').expect(200);

    // The same person named in another shop where they hold no membership.
    await pool.query(
      `update session set sess = json_build_object('userId', $2::text, 'orgId', $3::text, 'cookie', sess->'cookie', 'signedInAt', sess->'signedInAt', 'csrfToken', sess->'csrfToken') where sid = $1`,
      [sid, shop.users.admin.userId, other.orgId],
    );
    expect((await readSessionWithPrincipal(pool, sid, nowSeconds()))?.principal).toBeNull();
    await agent.get('/api/me').expect(401);

    // Back in the own shop: signed in again, until the membership is deactivated.
    await pool.query(
      `update session set sess = json_build_object('userId', $2::text, 'orgId', $3::text, 'cookie', sess->'cookie', 'signedInAt', sess->'signedInAt', 'csrfToken', sess->'csrfToken') where sid = $1`,
      [sid, shop.users.admin.userId, shop.orgId],
    );
    const me = await agent.get('/api/me').expect(200);
    expect(me.body.organization.id).toBe(shop.orgId);
    await pool.query(`update membership set active = false where id = $1`, [shop.users.admin.membershipId]);
    expect((await readSessionWithPrincipal(pool, sid, nowSeconds()))?.principal).toBeNull();
    await agent.get('/api/me').expect(401);
  });
});
