// A write sent again with the same Idempotency-Key (a lost answer, a double tap, the client's
// automatic retry) is carried out once; the retry gets the first answer back.
import { describe, it, expect, beforeAll, afterAll, afterEach } from 'vitest';
import { makeTestApp, type SignedIn } from '../setup/test-app';
import { approvedProcedure, appRole, countSignOffs, makeSafetyShop, PASSWORD, post, type SafetyShop } from './safety-helpers';
import { setClock, clock } from '../../shared/clock';
import { runScheduledPass } from '../../server/jobs/scheduler';
import { initORM } from '../../server/db';
import type { MikroORM } from '@mikro-orm/postgresql';
import { lockPoints } from './safety-helpers';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let shop: SafetyShop;
let torch: string;
let electrode: string;
let requirementId: string;
let procedureId: string;
let orm: MikroORM;
let keySeq = 0;
/** A fresh key per test action, as the client makes one per submit. */
const newKey = () => `test-key-${process.pid}-${Date.now()}-${++keySeq}`;

const sendWithKey = (who: SignedIn, url: string, body: unknown, key: string) =>
  who.agent
    .post(`/api${url}`)
    .set('X-CSRF-Token', who.csrf)
    .set('Idempotency-Key', key)
    .send(body as object);

async function count(sql: string, params: unknown[]): Promise<number> {
  const c = await appRole();
  try {
    return (await c.query(sql, params)).rows[0].n;
  } finally {
    await c.end();
  }
}
const changesOf = (torchId: string) => count('select count(*)::int as n from consumable_change where torch_id = $1', [torchId]);

const change = (minutesAgo: number) => ({
  torchId: torch,
  categories: ['electrode'],
  partTypeIds: { electrode },
  reason: 'preventive',
  changedAt: new Date(clock.ms() - minutesAgo * 60_000).toISOString(),
});

beforeAll(async () => {
  t = await makeTestApp();
  shop = await makeSafetyShop(t.app, t.em(), 'idem');
  const tech = shop.s.technician;
  torch = (await post(tech, '/machines', { code: 'PT1-T', name: 'Table torch', kind: 'torch' }).expect(201)).body.id;
  electrode = (
    await post(tech, '/part-types', { partNumber: 'EL-45', name: 'Electrode 45 A', category: 'electrode', leadTimeDays: 5, openingStock: 20 }).expect(201)
  ).body.id;
  procedureId = await approvedProcedure(shop);
  orm = await initORM();
  requirementId = (
    await post(shop.s.safety, '/safety/ppe/requirements', {
      machineId: shop.machineId,
      task: 'Punching',
      items: ['safety-glasses'],
      otherItems: [],
      arcCurrentA: null,
      noise: [],
      cadence: 'shift',
    }).expect(201)
  ).body.id;
});
afterEach(() => setClock(null));
afterAll(async () => {
  await orm.close(true);
  await t.close();
});

describe('Idempotency-Key on station records', () => {
  it('a retried consumable change with the same key returns the first answer and logs one change', async () => {
    const key = newKey();
    const before = await changesOf(torch);
    const body = change(30);
    const first = await sendWithKey(shop.s.operator, '/consumable-changes', body, key);
    expect(first.status, JSON.stringify(first.body)).toBe(201);
    // The same body, its keys in another order: the same request.
    const { torchId, ...rest } = body;
    const retry = await sendWithKey(shop.s.operator, '/consumable-changes', { ...rest, torchId }, key);
    expect(retry.status).toBe(201);
    expect(retry.body).toEqual(first.body);
    expect(retry.headers['idempotent-replayed']).toBe('true');
    expect(await changesOf(torch)).toBe(before + 1);
  });

  it('refuses the same key with a different body (422 idempotency_key_reused) and writes nothing', async () => {
    const key = newKey();
    await sendWithKey(shop.s.operator, '/consumable-changes', change(20), key).expect(201);
    const before = await changesOf(torch);
    const other = await sendWithKey(shop.s.operator, '/consumable-changes', change(10), key);
    expect(other.status).toBe(422);
    expect(other.body).toMatchObject({ error: 'idempotency_key_reused', message: expect.stringMatching(/key of a different request/) });
    // The same key on another endpoint is another request too.
    const elsewhere = await sendWithKey(shop.s.operator, '/cut-checks', { torchId: torch, dimensions: [] }, key);
    expect(elsewhere.status).toBe(422);
    expect(await changesOf(torch)).toBe(before);
  });

  it('keeps keys per person: another person sending the same key writes their own record', async () => {
    const key = newKey();
    const before = await changesOf(torch);
    await sendWithKey(shop.s.operator, '/consumable-changes', change(8), key).expect(201);
    const theirs = await sendWithKey(shop.s.technician, '/consumable-changes', change(8), key);
    expect(theirs.status).toBe(201);
    expect(theirs.headers['idempotent-replayed']).toBeUndefined();
    expect(await changesOf(torch)).toBe(before + 2);
  });

  it('forgets a key after 24 hours: the same request then writes again, and the pass removes expired keys', async () => {
    const key = newKey();
    const meter = (await post(shop.s.technician, '/meters', { machineId: torch, code: 'ARC', kind: 'count', name: 'Arc starts', unit: 'starts' }).expect(201))
      .body.id as string;
    const reading = { value: 1200, readAt: new Date(clock.ms() - 60_000).toISOString() };
    const readingsOf = () => count('select count(*)::int as n from meter_reading where meter_id = $1', [meter]);
    await sendWithKey(shop.s.operator, `/meters/${meter}/readings`, reading, key).expect(201);
    await sendWithKey(shop.s.operator, `/meters/${meter}/readings`, reading, key).expect(201);
    expect(await readingsOf()).toBe(1);
    setClock(new Date(clock.ms() + 25 * 3_600_000));
    const stored = () => count('select count(*)::int as n from idempotency_key where key = $1', [key]);
    expect(await stored()).toBe(1);
    // Past its day the key is free again: even another body under it is a new request, not a reuse.
    await sendWithKey(shop.s.operator, `/meters/${meter}/readings`, { ...reading, value: 1300 }, key).expect(201);
    expect(await readingsOf()).toBe(2);
    setClock(new Date(clock.ms() + 25 * 3_600_000));
    await runScheduledPass(orm, clock.now(), { orgId: shop.orgId });
    expect(await stored()).toBe(0);
  });
});

describe('Idempotency-Key on signatures', () => {
  it('a retried PPE check signs once; a refused first try (wrong password) frees the key for the corrected one', async () => {
    const key = newKey();
    const before = await countSignOffs(shop.orgId);
    const wrong = await sendWithKey(shop.s.operator, '/safety/ppe/checks', { requirementId, confirmed: ['safety-glasses'], password: 'not-it' }, key);
    expect(wrong.status).toBe(401);
    const body = { requirementId, confirmed: ['safety-glasses'], password: PASSWORD };
    const first = await sendWithKey(shop.s.operator, '/safety/ppe/checks', body, key);
    expect(first.status, JSON.stringify(first.body)).toBe(201);
    const retry = await sendWithKey(shop.s.operator, '/safety/ppe/checks', body, key);
    expect(retry.status).toBe(201);
    expect(retry.body).toEqual(first.body);
    expect(await countSignOffs(shop.orgId)).toBe(before + 1);
    // No digest of the password is kept with the key.
    const kept = await count(`select count(*)::int as n from idempotency_key where key = $1 and response_body::text not like '%' || $2 || '%'`, [
      key,
      PASSWORD,
    ]);
    expect(kept).toBe(1);
  });

  it('a retried lockout apply places one lockout and one signature', async () => {
    const key = newKey();
    const before = await countSignOffs(shop.orgId);
    const body = {
      procedureId,
      reason: 'Change the punch station tooling',
      points: lockPoints('ID'),
      password: PASSWORD,
    };
    const first = await sendWithKey(shop.s.technician, '/safety/lockouts', body, key);
    expect(first.status, JSON.stringify(first.body)).toBe(201);
    const retry = await sendWithKey(shop.s.technician, '/safety/lockouts', body, key);
    expect(retry.status).toBe(201);
    expect(retry.body).toEqual(first.body);
    expect(await countSignOffs(shop.orgId)).toBe(before + 1);
    expect(await count('select count(*)::int as n from safety_lockout where organization_id = $1', [shop.orgId])).toBe(1);
  });

  it('covers every signing route and every station record route', () => {
    const expected = [
      'POST /safety/procedures/:id/versions/:version/approve',
      'POST /safety/lockouts',
      'POST /safety/lockouts/:id/absent-removals',
      'POST /safety/absent-removals/:id/steps',
      'POST /safety/lockouts/:id/verify',
      'POST /safety/lockouts/:id/join',
      'POST /safety/lockouts/:id/leave',
      'POST /safety/lockouts/:id/handover',
      'POST /safety/lockouts/:id/accept-handover',
      'POST /safety/lockouts/:id/release',
      'POST /safety/lockouts/:id/test-windows',
      'POST /safety/lockouts/:id/test-windows/reapply',
      'POST /safety/lockouts/:id/test-windows/reverify',
      'POST /safety/lockouts/:id/outside-parties',
      'POST /safety/outside-parties/:id/acknowledge',
      'POST /safety/outside-parties/:id/inform',
      'POST /safety/outside-parties/:id/locks-on',
      'POST /safety/outside-parties/:id/locks-off',
      'POST /safety/ppe/checks',
      'POST /machines/:code/pre-use-checks',
      'POST /safety/inspections',
      'POST /safety/inspections/:id/certify',
      'POST /safety/training',
      'POST /safety/fire-watches',
      'POST /safety/fire-watches/:id/end',
      'POST /safety/sign-offs/:id/corrections',
      'POST /consumable-changes',
      'POST /cut-checks',
      'POST /meter-readings',
      'POST /meters/:id/readings',
    ];
    for (const route of expected) expect(t.routeAccess.has(route), `${route} exists`).toBe(true);
    expect([...t.api.idempotentRoutes].sort()).toEqual([...expected].sort());
  });
});
