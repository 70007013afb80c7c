import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { makeShop, makeTestApp, signIn, anonymous, type SignedIn, type TestShop } from '../setup/test-app';
import { ROLES, type Role } from '../../shared/permissions';

/**
 * Every API route and the roles allowed to call it. A route served by the app that is
 * missing here fails the suite: adding a route means deciding who may call it.
 * 'public' routes need no sign-in.
 */
const ALL: Role[] = [...ROLES];
const EXPECTED: Record<string, Role[] | 'public'> = {
  'GET /health': 'public',
  'GET /auth/csrf': 'public',
  'POST /auth/login': 'public',
  'POST /auth/logout': 'public',
  'POST /auth/request-reset': 'public',
  'POST /auth/redeem': 'public',
  'GET /me': ALL,
  'GET /users': ['admin'],
  'POST /users': ['admin'],
  'PATCH /users/:id': ['admin'],
  'POST /users/:id/resend-invitation': ['admin'],
  'GET /audit-events': ['admin', 'safety'],
  'GET /organization': ['admin'],
  'PATCH /organization': ['admin'],
  'GET /dev/inbox': ALL,
  'GET /plans': ALL,
  'POST /plans': ['admin'],
  'GET /plan-lookups': ALL,
  'GET /plans/:id': ALL,
  'PUT /plans/:id': ['admin'],
  'GET /plan-starters': ALL,
  'POST /plan-starters/apply': ['admin'],
  'GET /work-orders': ALL,
  'POST /work-orders': ALL,
  'GET /work-orders/:id': ALL,
  'PATCH /work-orders/:id': ['technician', 'safety', 'admin'],
  'POST /work-orders/:id/move': ['technician', 'safety', 'admin'],
  'PUT /work-orders/:id/checklist': ['technician', 'safety', 'admin'],
  'POST /work-orders/:id/parts': ['technician', 'safety', 'admin'],
  'DELETE /work-orders/:id/parts/:lineId': ['technician', 'safety', 'admin'],
  'POST /work-orders/:id/close': ['technician', 'safety', 'admin'],
  'POST /work-orders/:id/checklist/:key/repair': ['technician', 'safety', 'admin'],
  'POST /work-orders/:id/checklist/:key/deviation': ['safety'],
  'POST /work-orders/:id/attachments': ['technician', 'safety', 'admin'],
  'GET /work-orders/:id/attachments/:attachmentId': ALL,
  'GET /work-orders/:id/pdf': ALL,
  'GET /notify-preference': ALL,
  'PUT /notify-preference': ALL,
  'GET /oil-units': ALL,
  'PUT /oil-units/:id/target': ['technician', 'admin'],
  'GET /oil-analyses': ALL,
  'GET /oil-settings': ALL,
  'PUT /oil-settings': ['admin'],
  'POST /oil-analyses': ['technician', 'admin'],
  'GET /calendar-feed': ALL,
  'POST /calendar-feed': ALL,
  'DELETE /calendar-feed': ALL,
  'GET /calendar/:token': 'public',
  'GET /job-runs': ['admin'],
  'POST /job-runs': ['admin'],
  // Safety log
  'GET /safety/machines': ALL,
  'GET /safety/people': ALL,
  'GET /safety/settings': ALL,
  'PUT /safety/settings': ['safety', 'admin'],
  'GET /safety/tasks': ALL,
  'GET /safety/procedures': ALL,
  'POST /safety/procedures': ['technician', 'safety'],
  'GET /safety/procedures/:id': ALL,
  'PUT /safety/procedures/:id/draft': ['technician', 'safety'],
  'POST /safety/procedures/:id/versions/:version/approve': ['safety'],
  'POST /safety/procedures/:id/photos': ['technician', 'safety'],
  'GET /safety/procedures/:id/photos/:photoId': ALL,
  'DELETE /safety/procedures/:id/photos/:photoId': ['technician', 'safety'],
  'GET /safety/procedures/:id/authorization': ALL,
  'GET /safety/lockouts/:id/absent-removals': ALL,
  'POST /safety/lockouts/:id/absent-removals': ['admin', 'technician', 'safety'],
  'POST /safety/absent-removals/:id/steps': ['admin', 'technician', 'safety'],
  'GET /safety/lockouts/:id/outside-parties': ALL,
  'POST /safety/lockouts/:id/outside-parties': ['technician', 'safety'],
  'POST /safety/outside-parties/:id/acknowledge': ['technician', 'safety'],
  'POST /safety/outside-parties/:id/inform': ['technician', 'safety'],
  'POST /safety/outside-parties/:id/locks-on': ['technician', 'safety'],
  'POST /safety/outside-parties/:id/locks-off': ['technician', 'safety'],
  'GET /safety/locks': ALL,
  'GET /safety/procedures/:id/placard.pdf': ALL,
  'GET /safety/lockouts': ALL,
  'POST /safety/lockouts': ['technician', 'safety'],
  'GET /safety/lockouts/:id': ALL,
  'POST /safety/lockouts/:id/verify': ['technician', 'safety'],
  'POST /safety/lockouts/:id/join': ['technician', 'safety'],
  'POST /safety/lockouts/:id/leave': ['technician', 'safety'],
  'POST /safety/lockouts/:id/handover': ['technician', 'safety'],
  'POST /safety/lockouts/:id/accept-handover': ['technician', 'safety'],
  'POST /safety/lockouts/:id/release': ['technician', 'safety'],
  'GET /safety/lockouts/:id/test-windows': ALL,
  'POST /safety/lockouts/:id/test-windows': ['technician', 'safety'],
  'POST /safety/lockouts/:id/test-windows/reapply': ['technician', 'safety'],
  'POST /safety/lockouts/:id/test-windows/reverify': ['technician', 'safety'],
  'GET /safety/ppe/requirements': ALL,
  'POST /safety/ppe/requirements': ['safety'],
  'PUT /safety/ppe/requirements/:id': ['safety'],
  'DELETE /safety/ppe/requirements/:id': ['safety'],
  'POST /safety/ppe/checks': ['operator', 'technician', 'safety'],
  'GET /safety/inspections': ALL,
  'POST /safety/inspections': ['technician', 'safety'],
  'POST /safety/inspections/:id/certify': ['safety'],
  'GET /safety/training': ALL,
  'POST /safety/training': ['safety'],
  'GET /safety/fire-watches': ALL,
  'POST /safety/fire-watches': ['operator', 'technician', 'safety'],
  'POST /safety/fire-watches/:id/end': ['operator', 'technician', 'safety'],
  'GET /safety/sign-offs': ['safety', 'admin'],
  'POST /safety/sign-offs/:id/corrections': ['operator', 'technician', 'safety'],
  'GET /safety/events': ['safety', 'admin'],
  'GET /safety/chain/verify': ['safety', 'admin'],
  'POST /safety/chain/copies': ['safety', 'admin'],
  'POST /safety/chain/copies/check': ['safety', 'admin'],
  'GET /safety/audit/compliance': ['safety', 'admin'],
  'GET /safety/audit/timeline': ['safety', 'admin'],
  'GET /safety/audit/export.csv': ['safety', 'admin'],
  'GET /safety/audit/export.pdf': ['safety', 'admin'],
  'GET /machines': ALL,
  'POST /machines': ['admin', 'technician'],
  'GET /machines/:id': ALL,
  'PATCH /machines/:id': ['admin', 'technician'],
  'GET /machines/:id/photos': ALL,
  'POST /machines/:id/photos': ['admin', 'technician'],
  'GET /machines/:id/photos/:photoId': ALL,
  'DELETE /machines/:id/photos/:photoId': ['admin', 'technician'],
  'GET /machines/:code/status': ALL,
  'POST /machines/:code/out-of-service': ['technician', 'safety', 'admin'],
  'POST /machines/:code/return-to-service': ['technician', 'safety', 'admin'],
  'POST /machines/:code/faults': ALL,
  'PATCH /downtimes/:id': ['technician', 'safety', 'admin'],
  'GET /failure-codes': ALL,
  'GET /machines/:code/downtimes': ALL,
  'GET /reliability': ALL,
  'GET /machines/:code/light-curtain-checks': ALL,
  'POST /machines/:code/light-curtain-checks': ['technician', 'safety'],
  'GET /machines/:code/pre-use-checks': ALL,
  'POST /machines/:code/pre-use-checks': ['operator', 'technician', 'safety'],
  'POST /failure-codes': ['technician', 'admin'],
  'PATCH /failure-codes/:id': ['technician', 'admin'],
  'POST /meters': ['admin', 'technician'],
  'GET /meters/:id': ALL,
  'PATCH /meters/:id': ['admin', 'technician'],
  'GET /meters/:id/readings': ALL,
  'POST /meters/:id/readings': ['operator', 'technician', 'admin'],
  'GET /meters/:id/trend': ALL,
  'POST /meter-readings': ['operator', 'technician', 'admin'],
  'GET /counter-import/template': ALL,
  'POST /counter-import/preview': ['technician', 'admin'],
  'POST /counter-import': ['technician', 'admin'],
  'GET /part-types': ALL,
  'POST /part-types': ['technician', 'admin'],
  'GET /part-types/:id': ALL,
  'PATCH /part-types/:id': ['technician', 'admin'],
  'GET /part-types/:id/moves': ALL,
  'POST /stock-moves': ['technician', 'admin'],
  'GET /suppliers': ['technician', 'admin'],
  'POST /suppliers': ['technician', 'admin'],
  'GET /purchase-requests': ['technician', 'admin'],
  'POST /purchase-requests': ['technician', 'admin'],
  'POST /purchase-requests/:id/approve': ['admin'],
  'POST /purchase-requests/:id/order': ['admin'],
  'POST /purchase-requests/:id/cancel': ['admin'],
  'POST /purchase-requests/:id/receipts': ['technician', 'admin'],
  'GET /purchasing/suggestions': ['technician', 'admin'],
  'GET /purchasing/suggestions.csv': ['technician', 'admin'],
  'GET /stations/:code': ALL,
  'POST /consumable-changes': ['operator', 'technician', 'admin'],
  'GET /consumable-changes': ALL,
  'GET /consumable-changes/:id/photo': ALL,
  'GET /consumable-settings': ALL,
  'GET /consumable-life': ALL,
  'POST /cut-checks': ['operator', 'technician', 'admin'],
  'GET /cut-checks': ALL,
  'PATCH /consumable-settings': ['admin'],
  'GET /punch-tools': ALL,
  'POST /punch-tools': ['technician', 'admin'],
  'PATCH /punch-tools/:id': ['technician', 'admin'],
  'GET /punch-tools/:id/sharpenings': ALL,
  'POST /punch-tools/:id/sharpenings': ['technician', 'admin'],
};

type Layer = { route?: { path: string; methods: Record<string, boolean> } };

let t: Awaited<ReturnType<typeof makeTestApp>>;
let shop: TestShop;
const sessions = {} as Record<Role, SignedIn>;

function servedRoutes(): string[] {
  const stack = (t.api as unknown as { stack: Layer[] }).stack;
  return stack
    .filter((l) => l.route)
    .flatMap((l) =>
      Object.keys(l.route!.methods)
        .filter((m) => m !== '_all')
        .map((m) => `${m.toUpperCase()} ${l.route!.path}`),
    );
}

const samplePath = (path: string) => path.replace(/:[a-zA-Z]+/g, '00000000-0000-4000-8000-000000000000');

beforeAll(async () => {
  t = await makeTestApp();
  shop = await makeShop(t.em(), 'perm');
  for (const role of ROLES) sessions[role] = await signIn(t.app, shop.users[role].email);
});
afterAll(() => t.close());

describe('route permission table', () => {
  it('has a rule for every route the API serves, and no stale rules', () => {
    const served = servedRoutes();
    expect(served.length).toBeGreaterThan(5);
    const missing = served.filter((r) => !(r in EXPECTED));
    expect(missing, `routes without a rule in this table: ${missing.join(', ')}`).toEqual([]);
    const stale = Object.keys(EXPECTED).filter((r) => !served.includes(r));
    expect(stale, `rules for routes that no longer exist: ${stale.join(', ')}`).toEqual([]);
  });

  it('matches what each route declares in code', () => {
    for (const [key, allowed] of Object.entries(EXPECTED)) {
      const access = t.routeAccess.get(key);
      expect(access, key).toBeDefined();
      if (allowed === 'public') expect(access, key).toBe('public');
      else expect(access, key).not.toBe('public');
    }
  });

  const protectedRoutes = Object.entries(EXPECTED).filter(([, a]) => a !== 'public') as [string, Role[]][];

  it.each(protectedRoutes)('%s refuses anonymous callers with 401', async (key) => {
    const [method, path] = key.split(' ');
    const { agent, csrf } = await anonymous(t.app);
    const res = await agent[method.toLowerCase() as 'get'](`/api${samplePath(path)}`)
      .set('X-CSRF-Token', csrf)
      .send({});
    expect(res.status).toBe(401);
  });

  it.each(protectedRoutes)('%s refuses every role not allowed with 403', async (key, allowed) => {
    const [method, path] = key.split(' ');
    for (const role of ROLES.filter((r) => !allowed.includes(r))) {
      const { agent, csrf } = sessions[role];
      const res = await agent[method.toLowerCase() as 'get'](`/api${samplePath(path)}`)
        .set('X-CSRF-Token', csrf)
        .send({});
      expect(res.status, `${role} on ${key}`).toBe(403);
    }
  });

  it.each(protectedRoutes)('%s lets the allowed roles through the guard', async (key, allowed) => {
    const [method, path] = key.split(' ');
    for (const role of allowed) {
      const { agent, csrf } = sessions[role];
      const res = await agent[method.toLowerCase() as 'get'](`/api${samplePath(path)}`)
        .set('X-CSRF-Token', csrf)
        .send({});
      expect([401, 403], `${role} on ${key} got ${res.status}`).not.toContain(res.status);
    }
  });
});
