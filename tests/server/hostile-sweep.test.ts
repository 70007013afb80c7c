import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { randomUUID } from 'node:crypto';
import { anonymous, makeShop, makeTestApp, signIn, type SignedIn, type TestShop } from '../setup/test-app';
import { rolesFor, type Role } from '../../shared/permissions';
import type { Access } from '../../server/http/route';

/*
 * Every route the API serves, called with input no client should send: unknown ids and ids that
 * are not ids, text with NUL and lone surrogates, impossible dates, huge and negative numbers,
 * arrays where objects belong, deep nesting, prototype keys, and paths with broken
 * percent-encoding. Whatever the route, the answer must be a 4xx (never a 500) with a message.
 * The route list comes from the router itself, so a new route is swept without touching this file.
 * Without a valid body per route the sweep mostly stops at validation and lookups; the rules for
 * one bad field inside an otherwise valid body are in hostile-input.test.ts.
 */
let t: Awaited<ReturnType<typeof makeTestApp>>;
let shop: TestShop;
const agents = new Map<Role | 'public', SignedIn>();

const NUL = 'a\u0000b';
const LONE = 'a\uD800b';
const hostileObject = {
  name: NUL,
  title: LONE,
  code: `C${NUL}`,
  email: `x${NUL}@y.example`,
  password: LONE,
  note: NUL,
  notes: NUL,
  reason: LONE,
  description: NUL,
  machineId: 'not-a-uuid',
  partTypeId: randomUUID(),
  meterId: 'x',
  id: 'x',
  at: '0000-01-01T00:00:00Z',
  dueAt: '0000-00-00',
  readAt: '+010000-01-01T00:00:00Z',
  changedAt: 'yesterday',
  value: 1e308,
  quantity: -1e308,
  page: 'NaN',
  items: [NUL, null, {}],
  lines: {},
  settings: 'x',
  role: '__proto__',
  constructor: { prototype: { polluted: true } },
};
const deep = JSON.parse('{"a":'.repeat(200) + '1' + '}'.repeat(200)) as object;
const hostileQuery = '?page=-1&pageSize=1e9&from=0000-01-01&to=%2B010000-01-01&sort=constructor&dir=sideways&q=%00&machineId=x&status[]=open';

type Case = { label: string; params: (name: string) => string; body?: unknown; query?: string };
const cases: Case[] = [
  { label: 'hostile fields, unknown id', params: () => randomUUID(), body: hostileObject, query: hostileQuery },
  { label: 'empty body, id that is no id', params: () => 'not-a-uuid', body: {} },
  { label: 'array body', params: () => randomUUID(), body: [hostileObject] },
  { label: 'deep nesting', params: () => randomUUID(), body: deep },
  { label: 'NUL in the path', params: () => 'C1%00' },
  { label: 'broken percent-encoding in the path', params: () => '%E0%A4%A' },
];

function agentFor(access: Access): Role | 'public' {
  if (access === 'public') return 'public';
  if (access === 'signed-in') return 'admin';
  return rolesFor(access)[0];
}

async function session(who: Role | 'public'): Promise<SignedIn> {
  const s = who === 'public' ? await anonymous(t.app) : await signIn(t.app, shop.users[who].email);
  agents.set(who, s);
  return s;
}

beforeAll(async () => {
  t = await makeTestApp();
  shop = await makeShop(t.em(), 'sweep');
});
afterAll(() => t.close());

describe('hostile input on every route', () => {
  it('is answered with a 4xx and a message, never a 500', async () => {
    const routes = [...t.routeAccess.entries()];
    expect(routes.length).toBeGreaterThan(150);
    const failures: string[] = [];
    let sent = 0;
    for (const [key, access] of routes) {
      const [method, path] = key.split(' ');
      // Signing out or changing one's password ends the session the sweep runs in; both are swept by
      // their own tests, and here a fresh session is taken for the next route instead.
      const who = agentFor(access);
      for (const c of cases) {
        if (c.label.endsWith('in the path') && !path.includes(':')) continue;
        const url = '/api' + path.replace(/:(\w+)/g, (_m, name: string) => c.params(name)) + (c.query ?? '');
        const send = async () => {
          const s = agents.get(who) ?? (await session(who));
          const req = s.agent[method.toLowerCase() as 'get' | 'post' | 'put' | 'patch' | 'delete'](url).set('X-CSRF-Token', s.csrf);
          return method !== 'GET' && c.body !== undefined ? req.set('Content-Type', 'application/json').send(JSON.stringify(c.body)) : req;
        };
        let res = await send();
        if (res.status === 401 && who !== 'public') {
          agents.delete(who); // the session ended (signed out, password changed): retry in a fresh one
          res = await send();
        }
        sent++;
        const ok = res.status >= 400 && res.status < 500 && typeof res.body?.message === 'string' && res.body.message.length > 0;
        // A well-formed request can succeed: unknown fields are ignored and some routes need no input.
        if (!ok && !(res.status < 300 && res.status >= 200)) failures.push(`${key} [${c.label}] → ${res.status} ${JSON.stringify(res.body).slice(0, 160)}`);
      }
    }
    expect(sent).toBeGreaterThan(500);
    expect(failures).toEqual([]);
  });
});
