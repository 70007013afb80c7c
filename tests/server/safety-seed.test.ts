import { describe, it, expect, beforeAll, afterAll, afterEach } from 'vitest';
import { makeShop, makeTestApp, signIn } from '../setup/test-app';
import { Machine } from '../../server/modules/machines/machine.entity';
import { seedSafetyDemo } from '../../seed/demo-safety';
import { get } from './safety-helpers';
import { setClock } from '../../shared/clock';

let t: Awaited<ReturnType<typeof makeTestApp>>;
beforeAll(async () => {
  t = await makeTestApp();
});
afterAll(() => t.close());
afterEach(() => setClock(null));

describe('demo safety seed', () => {
  it('does nothing in a shop without machines', async () => {
    const shop = await makeShop(t.em(), 'seed-empty');
    await seedSafetyDemo(t.em(), { id: shop.orgId, timeZone: 'America/Chicago' });
    const s = await signIn(t.app, shop.users.safety.email);
    expect((await get(s, '/safety/chain/verify').expect(200)).body.total).toBe(0);
  });

  // The seed's history depends on the day it runs: a weekday or not 44 days back, before or after
  // the day shift, on a DST change. Seed at instants that once broke the time order.
  it.each([
    ['a Saturday night, UTC early morning', '2026-12-05T04:30:00Z', 'seed-sat'],
    ['a Wednesday before the day shift (05:00 in the shop)', '2026-12-09T11:00:00Z', 'seed-wed'],
    ['twenty minutes before the spring DST change', '2027-03-14T07:40:00Z', 'seed-dst'],
  ])('writes a year of history with a valid chain for the demo machines, seeded on %s', async (_when, at, slug) => {
    setClock(at);
    const shop = await makeShop(t.em(), slug);
    const em = t.em();
    for (const [code, kind, name] of [
      ['C1', 'punch-plasma-cell', 'Cell 1'],
      ['C2', 'punch-plasma-cell', 'Cell 2'],
      ['PT1', 'plasma-table', 'Plasma table'],
      ['B1', 'press-brake', 'Press brake'],
      ['HU1', 'hydraulic-unit', 'Hydraulic unit'],
      ['FX1', 'fume-extractor', 'Fume extractor'],
    ] as const) {
      em.create(Machine, { organization: shop.orgId, code, kind, name, active: true });
    }
    await em.flush();
    await seedSafetyDemo(t.em(), { id: shop.orgId, timeZone: 'America/Chicago' });
    const s = await signIn(t.app, shop.users.safety.email);
    const v = await get(s, '/safety/chain/verify').expect(200);
    expect(v.body.ok).toBe(true);
    expect(v.body.total).toBeGreaterThan(100);
    const procs = (await get(s, '/safety/procedures').expect(200)).body as { machineCode: string; currentVersion: number }[];
    expect(procs.map((p) => [p.machineCode, p.currentVersion])).toEqual([
      ['B1', 1],
      ['C1', 2],
      ['C2', 1],
      ['FX1', 1],
      ['HU1', 1],
      ['PT1', 1],
    ]);
    const open = (await get(s, '/safety/lockouts?state=open').expect(200)).body;
    expect(open.total).toBe(1);
    const certified = (await get(s, '/safety/inspections').expect(200)).body.filter((i: { certifiedAt: string | null }) => i.certifiedAt);
    expect(certified).toHaveLength(1);
    const training = (await get(s, '/safety/training').expect(200)).body as { status: string; machineCode: string }[];
    expect(training.filter((x) => x.status === 'retrain').map((x) => x.machineCode)).toEqual(['C1']); // the operator, after C1 version 2
    // Signatures are in time order along the chain.
    const rows = (await get(s, '/safety/sign-offs?sort=seq&dir=asc&pageSize=200').expect(200)).body.rows as { signedAt: string }[];
    for (let i = 1; i < rows.length; i++) expect(rows[i].signedAt >= rows[i - 1].signedAt).toBe(true);
    // Nothing is signed in the future of the day it was seeded.
    expect(rows.filter((r) => new Date(r.signedAt).getTime() > new Date(at).getTime() + 60_000)).toEqual([]);
    // Whatever the day, the plasma table's latest shift check is waiting.
    const tasks = (await get(s, '/safety/tasks').expect(200)).body as { title: string; status: string }[];
    expect(tasks.filter((x) => x.title.startsWith('PPE check at PT1')).map((x) => x.status)).toEqual([expect.stringMatching(/^(due|overdue)$/)]);
    const compliance = (await get(s, '/safety/audit/compliance?days=14').expect(200)).body;
    expect(compliance.totals.openLockouts).toBe(1);
    expect(compliance.totals.missedPpeChecks).toBeGreaterThan(0);
  });
});
