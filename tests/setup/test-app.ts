import { randomBytes } from 'node:crypto';
import supertest from 'supertest';
import type TestAgent from 'supertest/lib/agent';
import type { EntityManager } from '@mikro-orm/postgresql';
import { initORM } from '../../server/db';
import { createApp, type AppHandle } from '../../server/app';
import { loadConfig, type Config } from '../../server/config';
import { createMember, createShop, DEMO_PASSWORD } from '../../seed/factories';
import type { Role } from '../../shared/permissions';
import { FakeSmtp } from '../../server/mail/fake-smtp';
import { registerJobSteps } from '../../server/jobs/register';
import { SESSION_COOKIE } from '../../server/http/session';

export type TestShop = { orgId: string; slug: string; users: Record<Role, { email: string; userId: string; membershipId: string }> };

export async function makeTestApp(
  env: Record<string, string> = {},
  smtp: FakeSmtp | null = null,
): Promise<AppHandle & { config: Config; em: () => EntityManager }> {
  const config = loadConfig({ ...process.env, NODE_ENV: 'test', LOGIN_LIMIT_PER_ADDRESS: '10000', ...env });
  const orm = await initORM(config.DATABASE_URL);
  registerJobSteps(config); // as server/index.ts does at start
  const handle = createApp({ orm, config, smtp });
  return { ...handle, config, em: () => orm.em.fork() as EntityManager };
}

/** A fresh shop with one member per role; unique names so test files never collide. */
export async function makeShop(em: EntityManager, label = 'shop'): Promise<TestShop> {
  const slug = `${label}-${randomBytes(4).toString('hex')}`;
  const org = await createShop(em, { name: `Test ${slug}`, slug, timeZone: 'America/Chicago' });
  const users = {} as TestShop['users'];
  for (const role of ['operator', 'technician', 'safety', 'admin'] as Role[]) {
    const email = `${role}@${slug}.example`;
    const { user, membership } = await createMember(em, org, { email, name: `${role} of ${slug}`, role });
    users[role] = { email, userId: user.id, membershipId: membership.id };
  }
  return { orgId: org.id, slug, users };
}

export type SignedIn = { agent: TestAgent; csrf: string };

// API calls as a signed-in person; every change carries the CSRF header.
export const get = (s: SignedIn, url: string) => s.agent.get(`/api${url}`);
export const post = (s: SignedIn, url: string, body: unknown = {}) =>
  s.agent
    .post(`/api${url}`)
    .set('X-CSRF-Token', s.csrf)
    .send(body as object);
export const put = (s: SignedIn, url: string, body: unknown = {}) =>
  s.agent
    .put(`/api${url}`)
    .set('X-CSRF-Token', s.csrf)
    .send(body as object);
export const patch = (s: SignedIn, url: string, body: unknown = {}) =>
  s.agent
    .patch(`/api${url}`)
    .set('X-CSRF-Token', s.csrf)
    .send(body as object);
export const del = (s: SignedIn, url: string) => s.agent.delete(`/api${url}`).set('X-CSRF-Token', s.csrf).send({});

/** Signs in through the real endpoints (CSRF token first, then login). */
export async function signIn(app: AppHandle['app'], email: string, password = DEMO_PASSWORD): Promise<SignedIn> {
  const agent = supertest.agent(app);
  const first = await agent.get('/api/auth/csrf').expect(200);
  const res = await agent.post('/api/auth/login').set('X-CSRF-Token', first.body.token).send({ email, password });
  if (res.status !== 200) throw new Error(`sign-in as ${email} failed: ${res.status} ${JSON.stringify(res.body)}`);
  return { agent, csrf: res.body.csrfToken };
}

export async function anonymous(app: AppHandle['app']): Promise<SignedIn> {
  const agent = supertest.agent(app);
  const res = await agent.get('/api/auth/csrf').expect(200);
  return { agent, csrf: res.body.token };
}

/** The session id inside the signed cookie (`s:<id>.<signature>`) the agent holds (and sends). */
export async function sessionId(agent: TestAgent): Promise<string> {
  // The cookie is not re-sent on every answer: read what the agent sent with a request.
  const res = await agent.get('/api/auth/csrf');
  const sent = String((res as unknown as { req: { getHeader(name: string): unknown } }).req.getHeader('cookie') ?? '');
  const cookie = sent.split(/;\s*/).find((c) => c.startsWith(`${SESSION_COOKIE}=`));
  if (!cookie) throw new Error('the agent holds no session cookie');
  return decodeURIComponent(cookie.slice(SESSION_COOKIE.length + 1))
    .replace(/^s:/, '')
    .replace(/\.[^.]*$/, '');
}
