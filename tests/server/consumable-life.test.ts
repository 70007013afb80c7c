import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { makeShop, makeTestApp, post, signIn, type SignedIn, type TestShop } from '../setup/test-app';
import { fitWeibull, recommendedChangePoint, weibullBLife } from '../../shared/domain/weibull';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let a: TestShop;
let b: TestShop;
let tech: SignedIn;
let torch: string;
let cell: string;
let electrode: string;

const hoursAgo = (h: number) => new Date(Date.now() - h * 3600_000).toISOString();

beforeAll(async () => {
  t = await makeTestApp();
  a = await makeShop(t.em(), 'life-a');
  b = await makeShop(t.em(), 'life-b');
  tech = await signIn(t.app, a.users.technician.email);
  cell = (await post(tech, '/machines', { code: 'C1', name: 'Cell', kind: 'punch-plasma-cell' }).expect(201)).body.id;
  torch = (await post(tech, '/machines', { code: 'C1-T', name: 'Torch', kind: 'torch', parentId: cell }).expect(201)).body.id;
  await post(tech, '/meters', { machineId: torch, code: 'arc-starts', name: 'Arc starts', kind: 'count', unit: 'starts' }).expect(201);
  await post(tech, '/meters', { machineId: torch, code: 'arc-hours', name: 'Arc hours', kind: 'running-time', unit: 'h' }).expect(201);
  electrode = (
    await post(tech, '/part-types', {
      partNumber: 'EL-9',
      name: 'Electrode',
      category: 'electrode',
      lifeUnit: 'starts',
      expectedLife: 1000,
      unitCost: 15,
      leadTimeDays: 5,
      openingStock: 50,
    }).expect(201)
  ).body.id;
  // Lives in starts and arc hours, and why each part came out.
  const plan: [number, number, string][] = [
    [900, 11, 'normal-wear'],
    [1100, 13, 'normal-wear'],
    [500, 6, 'preventive'], // suspension: changed on plan
    [1000, 12, 'failed-start'],
    [1200, 15, 'poor-cut'],
    [200, 2, 'damaged'], // suspension: not wear
  ];
  let starts = 5000;
  let hours = 60;
  let h = 100;
  await post(tech, '/consumable-changes', {
    torchId: torch,
    categories: ['electrode'],
    partTypeIds: { electrode },
    reason: 'preventive',
    startsReading: starts,
    arcHoursReading: hours,
    changedAt: hoursAgo(h--),
  }).expect(201);
  for (const [life, lifeHours, reason] of plan) {
    starts += life;
    hours += lifeHours;
    await post(tech, '/consumable-changes', {
      torchId: torch,
      categories: ['electrode'],
      reason,
      startsReading: starts,
      arcHoursReading: hours,
      changedAt: hoursAgo(h--),
    }).expect(201);
  }
  // The part in the torch now has 300 starts on it: a suspension too.
  await post(tech, `/meters/${(await tech.agent.get(`/api/stations/C1`)).body.torches[0].startsMeter.id}/readings`, {
    value: starts + 300,
    readAt: hoursAgo(1),
  }).expect(201);
});
afterAll(() => t.close());

describe('consumable life statistics', () => {
  it('splits lives into failures and suspensions and fits a Weibull with them', async () => {
    const res = await tech.agent.get(`/api/consumable-life?partTypeId=${electrode}`).expect(200);
    const s = res.body;
    expect(s.unit).toBe('starts');
    expect([...s.failures].sort((x: number, y: number) => x - y)).toEqual([900, 1000, 1100, 1200]);
    // The first install (its removal) counted from the first change; preventive, damaged and still-installed parts are suspensions.
    expect([...s.suspensions].sort((x: number, y: number) => x - y)).toEqual([200, 300, 500]);
    expect(s.stillInstalled).toBe(1);
    const fit = fitWeibull([900, 1100, 1000, 1200], [500, 200, 300]);
    expect(s.fit.shape).toBeCloseTo(fit.shape, 9);
    expect(s.fit.scale).toBeCloseTo(fit.scale, 6);
    expect(s.fit.b10).toBeCloseTo(weibullBLife(fit, 0.1), 6);
    // Change point at 90 % reliability by default (common practice, site-adjustable).
    expect(s.fit.targetReliability).toBe(0.9);
    expect(s.fit.recommended).toBeCloseTo(recommendedChangePoint(fit, 0.9), 6);
    expect(s.fit.curve[0]).toEqual({ life: 0, reliability: 1 });
    // Cost per arc-hour: 6 removed electrodes × 15 / (11 + 13 + 6 + 12 + 15 + 2) h.
    expect(s.costPerArcHour).toBeCloseTo((6 * 15) / 59, 10);
    expect(s.meanLife).toBeCloseTo((900 + 1100 + 500 + 1000 + 1200 + 200) / 6, 10);
    expect(s.histogram.reduce((n: number, b: { failures: number; suspensions: number }) => n + b.failures + b.suspensions, 0)).toBe(7);
    expect(s.perMachine).toEqual([expect.objectContaining({ machineCode: 'C1-T', removed: 6 })]);
  });

  it('filters by machine, and says why there is no fit when data are too few', async () => {
    const other = (await post(tech, '/machines', { code: 'C2', name: 'Cell 2', kind: 'punch-plasma-cell' }).expect(201)).body.id;
    const res = await tech.agent.get(`/api/consumable-life?partTypeId=${electrode}&machineId=${other}`).expect(200);
    expect(res.body).toMatchObject({ failures: [], suspensions: [], fit: null, fitProblem: 'A fit needs at least 3 worn-out parts; 0 so far.' });
    const mine = await tech.agent.get(`/api/consumable-life?partTypeId=${electrode}&machineId=${cell}`).expect(200);
    expect(mine.body.failures).toHaveLength(4);
  });

  it("refuses bad queries and another shop's part", async () => {
    await tech.agent.get('/api/consumable-life?partTypeId=nope').expect(400);
    const other = await signIn(t.app, b.users.technician.email);
    await other.agent.get(`/api/consumable-life?partTypeId=${electrode}`).expect(404);
  });
});
