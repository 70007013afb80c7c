import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { makeShop, makeTestApp, patch, post, signIn, type SignedIn, type TestShop } from '../setup/test-app';
import { fitWeibull, optimalChangeAge, runToFailureCostRate, weibullConfidenceBounds } from '../../shared/domain/weibull';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let a: TestShop;
let tech: SignedIn;
let op: SignedIn;
let torch: string;
let electrode: string;
let nozzle: string;

const hoursAgo = (h: number) => new Date(Date.now() - h * 3600_000).toISOString();
const life = (partTypeId: string) => tech.agent.get(`/api/consumable-life?partTypeId=${partTypeId}`).expect(200);

beforeAll(async () => {
  t = await makeTestApp();
  a = await makeShop(t.em(), 'reasons');
  tech = await signIn(t.app, a.users.technician.email);
  op = await signIn(t.app, a.users.operator.email);
  const cell = (await post(tech, '/machines', { code: 'R1', name: 'Cell', kind: 'punch-plasma-cell' }).expect(201)).body.id;
  torch = (await post(tech, '/machines', { code: 'R1-T', name: 'Torch', kind: 'torch', parentId: cell }).expect(201)).body.id;
  await post(tech, '/meters', { machineId: torch, code: 'arc-starts', name: 'Arc starts', kind: 'count', unit: 'starts' }).expect(201);
  const part = (partNumber: string, category: string, extra: object = {}) =>
    post(tech, '/part-types', {
      partNumber,
      name: partNumber,
      category,
      lifeUnit: 'starts',
      expectedLife: 1000,
      unitCost: 15,
      leadTimeDays: 5,
      openingStock: 60,
      ...extra,
    })
      .expect(201)
      .then((r) => r.body.id as string);
  electrode = await part('EL-R', 'electrode', { plannedChangeCost: 20, failureCost: 140 });
  nozzle = await part('NZ-R', 'nozzle');
  await post(tech, '/consumable-changes', {
    torchId: torch,
    categories: ['electrode', 'nozzle'],
    partTypeIds: { electrode, nozzle },
    reasons: { electrode: 'preventive', nozzle: 'preventive' },
    startsReading: 1000,
    changedAt: hoursAgo(60),
  }).expect(201);
  // Electrode lives; the nozzle goes out with each electrode except once, when gas pressure killed it early.
  const lives = [820, 1040, 930, 1210, 760, 990, 1120, 880];
  let starts = 1000;
  let h = 50;
  for (const [k, l] of lives.entries()) {
    starts += l;
    await post(op, '/consumable-changes', {
      torchId: torch,
      categories: ['electrode', 'nozzle'],
      reasons: { electrode: k === 3 ? 'failed-start' : 'worn', nozzle: k === 5 ? 'gas-pressure' : 'with-partner' },
      startsReading: starts,
      changedAt: hoursAgo(h--),
    }).expect(201);
  }
});
afterAll(() => t.close());

describe('a reason per part removed', () => {
  it('worn electrodes are failures; nozzles changed with them are suspensions; a process fault is kept apart', async () => {
    const el = (await life(electrode)).body;
    expect(el.failures).toHaveLength(8);
    const nz = (await life(nozzle)).body;
    expect(nz.failures).toHaveLength(0);
    expect(nz.suspensions.length).toBeGreaterThanOrEqual(8);
    expect(nz.processFaults).toBe(1);
    expect(nz.byReason).toEqual(
      expect.arrayContaining([
        { reason: 'with-partner', kind: 'suspension', count: 7 },
        { reason: 'gas-pressure', kind: 'process', count: 1 },
      ]),
    );
    expect(nz.fit).toBeNull();
  });

  it('one reason for the whole change (older clients) goes to the lead part; the other came out with it', async () => {
    const res = await post(op, '/consumable-changes', { torchId: torch, categories: ['electrode', 'nozzle'], reason: 'poor-cut' }).expect(201);
    const s = (await tech.agent.get('/api/stations/R1').expect(200)).body;
    const row = s.recentChanges.find((c: { id: string }) => c.id === res.body.id);
    expect(row.parts.map((p: { category: string; reason: string }) => [p.category, p.reason])).toEqual([
      ['electrode', 'with-partner'],
      ['nozzle', 'poor-cut'],
    ]);
  });

  it('refuses a part without a reason, and a reason for a part that did not come out; nothing written', async () => {
    const before = (await life(electrode)).body.failures.length;
    const none = await post(op, '/consumable-changes', { torchId: torch, categories: ['electrode', 'nozzle'], reasons: { electrode: 'worn' } }).expect(400);
    expect(none.body.fields).toEqual(expect.arrayContaining([expect.objectContaining({ path: 'reasons.nozzle' })]));
    const stray = await post(op, '/consumable-changes', {
      torchId: torch,
      categories: ['electrode'],
      reasons: { electrode: 'worn', shield: 'damaged' },
    }).expect(400);
    expect(stray.body.fields).toEqual(expect.arrayContaining([expect.objectContaining({ path: 'reasons.shield' })]));
    const bad = await post(op, '/consumable-changes', { torchId: torch, categories: ['electrode'], reasons: { electrode: 'tired' } }).expect(400);
    expect(bad.body.fields).toEqual(expect.arrayContaining([expect.objectContaining({ path: 'reasons.electrode' })]));
    expect((await life(electrode)).body.failures.length).toBe(before);
  });
});

describe('fit bounds, few-failure warning and the cheapest change point', () => {
  it('shows Fisher-matrix bounds, warns below 10 failures, and the optimum of the age-replacement cost', async () => {
    const s = (await life(electrode)).body;
    const fit = fitWeibull(s.failures, s.suspensions);
    const bounds = weibullConfidenceBounds(s.failures, s.suspensions, fit, 0.9);
    expect(s.fit.bounds.method).toBe('fisher-matrix');
    expect(s.fit.bounds.level).toBe(0.9);
    expect(s.fit.bounds.b10.lower).toBeCloseTo(bounds.b10.lower, 6);
    expect(s.fit.bounds.b10.upper).toBeCloseTo(bounds.b10.upper, 6);
    expect(s.fit.bounds.b10.lower).toBeLessThan(s.fit.b10);
    expect(s.warning).toMatch(/Only \d worn-out parts/);
    const best = optimalChangeAge(fit, { plannedCost: 20, failureCost: 140 })!;
    expect(s.fit.plan).toMatchObject({ plannedCost: 20, failureCost: 140, note: null });
    expect(s.fit.plan.age).toBeCloseTo(best.age, 6);
    const rtf = runToFailureCostRate(fit, 140);
    expect(s.fit.plan.savingPercent).toBeCloseTo((1 - best.costRate / rtf) * 100, 6);
  });

  it('the station shows B10 and the cheapest change point beside each installed part', async () => {
    const s = (await tech.agent.get('/api/stations/R1').expect(200)).body;
    const el = s.torches[0].installed.find((i: { category: string }) => i.category === 'electrode');
    expect(el.plan.b10).toBeGreaterThan(0);
    expect(el.plan.change.age).toBeGreaterThan(el.plan.b10 * 0.5);
    const nz = s.torches[0].installed.find((i: { category: string }) => i.category === 'nozzle');
    expect(nz.plan).toBeNull();
  });

  it('the station’s plans follow every change of their inputs, though kept between requests', async () => {
    const stationElectrode = async () =>
      (await tech.agent.get('/api/stations/R1').expect(200)).body.torches[0].installed.find((i: { category: string }) => i.category === 'electrode').plan;
    // The consumable-life page computes the same fit afresh on every request: the reference.
    const expectSameAsLifePage = async () => {
      const [plan, fresh] = [await stationElectrode(), (await life(electrode)).body];
      expect(plan.failures).toBe(fresh.failures.length);
      expect(plan.b10).toBeCloseTo(fresh.fit.b10, 9);
      if (fresh.fit.plan.age === null) expect(plan.change.age).toBeNull();
      else expect(plan.change.age).toBeCloseTo(fresh.fit.plan.age, 9);
      return plan;
    };
    const first = await expectSameAsLifePage();
    expect(await stationElectrode()).toEqual(first);
    // The part still in the torch runs on: its life so far (a suspension) grows.
    const meter = (await tech.agent.get(`/api/machines/${torch}`).expect(200)).body.meters.find((m: { code: string }) => m.code === 'arc-starts').id;
    const latest = (await tech.agent.get(`/api/meters/${meter}`).expect(200)).body.latest.value as number;
    await post(op, '/meter-readings', { readings: [{ meterId: meter, value: latest + 1500 }] }).expect(201);
    const longer = await expectSameAsLifePage();
    expect(longer.b10).not.toBeCloseTo(first.b10, 6);
    // Another worn-out electrode: one more failure.
    await post(op, '/consumable-changes', { torchId: torch, categories: ['electrode'], reasons: { electrode: 'worn' }, startsReading: latest + 1600 }).expect(
      201,
    );
    expect((await expectSameAsLifePage()).failures).toBe(first.failures + 1);
    // The part's costs move the cheapest change point.
    await patch(tech, `/part-types/${electrode}`, { failureCost: 400 }).expect(200);
    const costlier = await expectSameAsLifePage();
    await patch(tech, `/part-types/${electrode}`, { failureCost: 140 }).expect(200);
    expect((await expectSameAsLifePage()).change.age).not.toBeCloseTo(costlier.change.age, 6);
  });

  it('without a failure cost there is no optimum, and the fit says so', async () => {
    await patch(tech, `/part-types/${electrode}`, { failureCost: null }).expect(200);
    const s = (await life(electrode)).body;
    expect(s.fit.plan.age).toBeNull();
    expect(s.fit.plan.note).toMatch(/cost of a failure/);
    await patch(tech, `/part-types/${electrode}`, { failureCost: 140 }).expect(200);
  });

  it('refuses negative costs and a failure cost not above the planned cost, naming the field; nothing written', async () => {
    const neg = await post(tech, '/part-types', { partNumber: 'X-1', name: 'X one', category: 'nozzle', leadTimeDays: 1, failureCost: -5 }).expect(400);
    expect(neg.body.fields).toEqual([expect.objectContaining({ path: 'failureCost' })]);
    const negPlanned = await post(tech, '/part-types', { partNumber: 'X-1', name: 'X one', category: 'nozzle', leadTimeDays: 1, plannedChangeCost: -1 }).expect(
      400,
    );
    expect(negPlanned.body.fields).toEqual([expect.objectContaining({ path: 'plannedChangeCost' })]);
    const low = await post(tech, '/part-types', { partNumber: 'X-1', name: 'X one', category: 'nozzle', leadTimeDays: 1, unitCost: 10, failureCost: 8 }).expect(
      400,
    );
    expect(low.body.fields).toEqual([expect.objectContaining({ path: 'failureCost', message: expect.stringMatching(/no cheapest change point/) })]);
    const list = (await tech.agent.get('/api/part-types').expect(200)).body as { partNumber: string }[];
    expect(list.some((p) => p.partNumber === 'X-1')).toBe(false);
    // On a change too, against the stored planned cost (20).
    const upd = await patch(tech, `/part-types/${electrode}`, { failureCost: 15 }).expect(400);
    expect(upd.body.fields).toEqual([expect.objectContaining({ path: 'failureCost' })]);
    expect((await tech.agent.get(`/api/part-types/${electrode}`).expect(200)).body.failureCost).toBe(140);
  });
});
