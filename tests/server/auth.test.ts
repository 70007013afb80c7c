import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import supertest from 'supertest';
import { anonymous, makeShop, makeTestApp, signIn, type TestShop } from '../setup/test-app';
import { SESSION_COOKIE } from '../../server/http/session';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let shop: TestShop;

beforeAll(async () => {
  t = await makeTestApp({ LOGIN_LIMIT_PER_ACCOUNT: '3' });
  shop = await makeShop(t.em(), 'auth');
});
afterAll(() => t.close());

const sid = (res: supertest.Response) =>
  ([] as string[])
    .concat(res.headers['set-cookie'] ?? [])
    .find((c) => c.startsWith(`${SESSION_COOKIE}=`))
    ?.split(';')[0];

describe('sign-in', () => {
  it('signs in, answers /api/me with user, role and shop, and signs out', async () => {
    const { agent, csrf } = await signIn(t.app, shop.users.technician.email);
    const me = await agent.get('/api/me').expect(200);
    expect(me.body.user.email).toBe(shop.users.technician.email);
    expect(me.body.role).toBe('technician');
    expect(me.body.organization.id).toBe(shop.orgId);
    await agent.post('/api/auth/logout').set('X-CSRF-Token', csrf).expect(200);
    await agent.get('/api/me').expect(401);
  });

  it('issues a new session id at sign-in (no session fixation)', async () => {
    const agent = supertest.agent(t.app);
    const before = await agent.get('/api/auth/csrf').expect(200);
    const preLoginSid = sid(before);
    expect(preLoginSid).toBeTruthy();
    const login = await agent
      .post('/api/auth/login')
      .set('X-CSRF-Token', before.body.token)
      .send({ email: shop.users.operator.email, password: 'kerfbook-demo' })
      .expect(200);
    const postLoginSid = sid(login);
    expect(postLoginSid).toBeTruthy();
    expect(postLoginSid).not.toBe(preLoginSid);
    // The old id is dead: replaying it does not give the signed-in session.
    await supertest(t.app).get('/api/me').set('Cookie', preLoginSid!).expect(401);
    await supertest(t.app).get('/api/me').set('Cookie', postLoginSid!).expect(200);
  });

  it('answers a wrong password with 401 and a clear message', async () => {
    const { agent, csrf } = await anonymous(t.app);
    const res = await agent.post('/api/auth/login').set('X-CSRF-Token', csrf).send({ email: shop.users.admin.email, password: 'not-the-password' }).expect(401);
    expect(res.body.message).toMatch(/e-mail or password/i);
  });

  it('names the bad fields of malformed sign-in input', async () => {
    const { agent, csrf } = await anonymous(t.app);
    const res = await agent.post('/api/auth/login').set('X-CSRF-Token', csrf).send({ email: 'not-an-email' }).expect(400);
    expect(res.body.fields).toEqual(
      expect.arrayContaining([
        { path: 'email', message: 'Enter a valid e-mail address' },
        { path: 'password', message: 'Password is required' },
      ]),
    );
  });

  it('rejects non-JSON bodies with 400, not 500', async () => {
    const { agent, csrf } = await anonymous(t.app);
    const res = await agent.post('/api/auth/login').set('X-CSRF-Token', csrf).set('Content-Type', 'application/json').send('{"email":');
    expect(res.status).toBe(400);
    expect(res.body.message).toMatch(/not valid JSON/);
  });

  it('rate-limits failed sign-ins per account', async () => {
    const email = shop.users.safety.email;
    const { agent, csrf } = await anonymous(t.app);
    for (let i = 0; i < 3; i++) await agent.post('/api/auth/login').set('X-CSRF-Token', csrf).send({ email, password: 'wrong-password' }).expect(401);
    const blocked = await agent.post('/api/auth/login').set('X-CSRF-Token', csrf).send({ email, password: 'kerfbook-demo' });
    expect(blocked.status).toBe(429);
    expect(blocked.body.message).toMatch(/too many failed sign-ins/i);
    // Another account from the same address is not affected.
    await signIn(t.app, shop.users.admin.email);
  });

  it('rate-limits sign-ins per address', async () => {
    const limited = await makeTestApp({ LOGIN_LIMIT_PER_ADDRESS: '2' });
    const { agent, csrf } = await anonymous(limited.app);
    for (let i = 0; i < 2; i++)
      await agent
        .post('/api/auth/login')
        .set('X-CSRF-Token', csrf)
        .send({ email: `nobody${i}@x.example`, password: 'x' })
        .expect(401);
    const res = await agent.post('/api/auth/login').set('X-CSRF-Token', csrf).send({ email: 'other@x.example', password: 'x' });
    expect(res.status).toBe(429);
    await limited.close();
  });

  it('does not count successful sign-ins against the address (shared shop-floor tablets)', async () => {
    const limited = await makeTestApp({ LOGIN_LIMIT_PER_ADDRESS: '2' });
    for (let i = 0; i < 3; i++) await signIn(limited.app, shop.users.operator.email);
    const { agent, csrf } = await anonymous(limited.app);
    const res = await agent.post('/api/auth/login').set('X-CSRF-Token', csrf).send({ email: 'nobody@x.example', password: 'x' });
    expect(res.status).toBe(401);
    await limited.close();
  });

  it('ends the session after the absolute timeout even when active', async () => {
    const short = await makeTestApp({ SESSION_ABSOLUTE_HOURS: '1' });
    const { agent } = await signIn(short.app, shop.users.operator.email);
    await agent.get('/api/me').expect(200);
    const realNow = Date.now;
    try {
      Date.now = () => realNow() + 3600_000 + 1000;
      await agent.get('/api/me').expect(401);
    } finally {
      Date.now = realNow;
    }
    await short.close();
  });
});

describe('CSRF', () => {
  it('refuses a state-changing request without the token', async () => {
    const { agent } = await signIn(t.app, shop.users.admin.email);
    const res = await agent.post('/api/users').send({ name: 'No Token', email: 'no-token@x.example', role: 'operator' }).expect(403);
    expect(res.body.message).toMatch(/CSRF/);
  });

  it('refuses a wrong token', async () => {
    const { agent } = await signIn(t.app, shop.users.admin.email);
    await agent.post('/api/auth/logout').set('X-CSRF-Token', 'forged-token-forged-token').expect(403);
  });

  it('refuses sign-in without a token (login CSRF)', async () => {
    await supertest(t.app).post('/api/auth/login').send({ email: shop.users.admin.email, password: 'kerfbook-demo' }).expect(403);
  });
});

describe('API conventions', () => {
  it('answers unknown API routes with JSON 404', async () => {
    const res = await supertest(t.app).get('/api/no-such-thing').expect(404);
    expect(res.body).toEqual({ error: 'not_found', message: 'API route not found' });
  });

  it('reports health including the database', async () => {
    const res = await supertest(t.app).get('/api/health').expect(200);
    expect(res.body).toMatchObject({ status: 'ok', database: 'ok' });
  });

  it('sends security headers', async () => {
    const res = await supertest(t.app).get('/api/health');
    expect(res.headers['content-security-policy']).toContain("default-src 'self'");
    expect(res.headers['x-content-type-options']).toBe('nosniff');
  });

  it('sets the session cookie httpOnly and SameSite=Lax', async () => {
    const res = await supertest(t.app).get('/api/auth/csrf');
    const cookie = ([] as string[]).concat(res.headers['set-cookie'] ?? []).find((c) => c.startsWith(SESSION_COOKIE));
    expect(cookie).toMatch(/HttpOnly/);
    expect(cookie).toMatch(/SameSite=Lax/);
    expect(cookie).not.toMatch(/Secure/); // plain HTTP here; 'auto' adds Secure over HTTPS
  });

  it('marks the session cookie Secure when served over HTTPS behind a trusted proxy', async () => {
    const proxied = await makeTestApp({ TRUST_PROXY: '1' });
    const res = await supertest(proxied.app).get('/api/auth/csrf').set('X-Forwarded-Proto', 'https');
    const cookie = ([] as string[]).concat(res.headers['set-cookie'] ?? []).find((c) => c.startsWith(SESSION_COOKIE));
    expect(cookie).toMatch(/; Secure/);
    await proxied.close();
  });
});
