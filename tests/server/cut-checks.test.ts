import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { makeShop, makeTestApp, post, signIn, type SignedIn, type TestShop } from '../setup/test-app';
import { CutCheck } from '../../server/modules/station/consumable.entity';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let a: TestShop;
let b: TestShop;
let tech: SignedIn;
let op: SignedIn;
let torch: string;

const minutesAgo = (m: number) => new Date(Date.now() - m * 60_000).toISOString();
const coupon = (length: number, width: number) => [
  { label: 'Length', nominalMm: 100, measuredMm: length },
  { label: 'Width', nominalMm: 50, measuredMm: width },
];

beforeAll(async () => {
  t = await makeTestApp();
  a = await makeShop(t.em(), 'cut-a');
  b = await makeShop(t.em(), 'cut-b');
  tech = await signIn(t.app, a.users.technician.email);
  op = await signIn(t.app, a.users.operator.email);
  torch = (await post(tech, '/machines', { code: 'P1-T', name: 'Table torch', kind: 'torch' }).expect(201)).body.id;
  const el = (
    await post(tech, '/part-types', { partNumber: 'EL-80', name: 'Electrode 80 A', category: 'electrode', leadTimeDays: 5, openingStock: 5 }).expect(201)
  ).body.id;
  const nz = (await post(tech, '/part-types', { partNumber: 'NZ-80', name: 'Nozzle 80 A', category: 'nozzle', leadTimeDays: 5, openingStock: 5 }).expect(201))
    .body.id;
  await post(op, '/consumable-changes', {
    torchId: torch,
    categories: ['electrode', 'nozzle'],
    partTypeIds: { electrode: el, nozzle: nz },
    reason: 'preventive',
    changedAt: minutesAgo(120),
  }).expect(201);
});
afterAll(() => t.close());

describe('cut-quality checks', () => {
  it('passes a coupon within ±0.2 mm (the limit itself included) and ties it to the parts in the torch', async () => {
    // Symmetric bilateral tolerance: |measured − nominal| ≤ t passes (ISO 286-1 limits of size).
    const res = await post(op, '/cut-checks', { torchId: torch, checkedAt: minutesAgo(90), dimensions: coupon(100.2, 49.85) }).expect(201);
    expect(res.body).toMatchObject({ passed: true, toleranceMm: 0.2, maxDeviationMm: 0.2, torchCode: 'P1-T' });
    expect(res.body.dimensions.map((d: { deviationMm: number; within: boolean }) => [d.deviationMm, d.within])).toEqual([
      [0.2, true],
      [-0.15, true],
    ]);
    expect(res.body.installedParts.map((p: { partNumber: string }) => p.partNumber).sort()).toEqual(['EL-80', 'NZ-80']);
    const station = (await op.agent.get('/api/stations/P1-T').expect(200)).body;
    expect(station.torches[0].suggestChange).toBe(false);
  });

  it('fails a coupon out of tolerance and suggests a consumable change until the next change', async () => {
    const res = await post(op, '/cut-checks', { torchId: torch, checkedAt: minutesAgo(60), dimensions: coupon(100.21, 50) }).expect(201);
    expect(res.body).toMatchObject({ passed: false, maxDeviationMm: 0.21 });
    let station = (await op.agent.get('/api/stations/P1-T').expect(200)).body;
    expect(station.torches[0]).toMatchObject({ suggestChange: true, latestCutCheck: { passed: false, afterLastChange: true } });
    await post(op, '/consumable-changes', { torchId: torch, categories: ['electrode', 'nozzle'], reason: 'poor-cut', changedAt: minutesAgo(30) }).expect(201);
    station = (await op.agent.get('/api/stations/P1-T').expect(200)).body;
    expect(station.torches[0]).toMatchObject({ suggestChange: false, latestCutCheck: { passed: false, afterLastChange: false } });
  });

  it("uses the site's tolerance when it sets one", async () => {
    const admin = await signIn(t.app, a.users.admin.email);
    await admin.agent.patch('/api/consumable-settings').set('X-CSRF-Token', admin.csrf).send({ cutToleranceMm: 0.3 }).expect(200);
    const res = await post(op, '/cut-checks', { torchId: torch, dimensions: coupon(100.25, 50) }).expect(201);
    expect(res.body).toMatchObject({ passed: true, toleranceMm: 0.3 });
    const list = await op.agent.get('/api/cut-checks').expect(200);
    expect(list.body.total).toBe(3);
  });

  it('refuses bad input with field paths and writes nothing', async () => {
    const em = t.em();
    em.setFilterParams('org', { orgId: a.orgId });
    const before = await em.count(CutCheck, {});
    const none = await post(op, '/cut-checks', { torchId: torch, dimensions: [] }).expect(400);
    expect(none.body.fields[0]).toEqual({ path: 'dimensions', message: 'Enter at least one measured dimension' });
    const neg = await post(op, '/cut-checks', { torchId: torch, dimensions: [{ label: 'L', nominalMm: 100, measuredMm: -1 }] }).expect(400);
    expect(neg.body.fields[0].path).toBe('dimensions.0.measuredMm');
    expect(await em.count(CutCheck, {})).toBe(before);
    const other = await signIn(t.app, b.users.operator.email);
    await post(other, '/cut-checks', { torchId: torch, dimensions: coupon(100, 50) }).expect(404);
  });
});
