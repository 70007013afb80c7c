import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { makeShop, makeTestApp, signIn, type SignedIn, type TestShop } from '../setup/test-app';
import { STARTER_PLANS } from '../../shared/domain/starter-plans';
import { get, makeMachine, makeMeter, makePart, planBody, post, put, scoped } from './work-orders-fixtures';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let a: TestShop;
let admin: SignedIn;
let op: SignedIn;
let unit: string;
let cell: string;
let pumpHours: string;

beforeAll(async () => {
  t = await makeTestApp();
  a = await makeShop(t.em(), 'plans');
  admin = await signIn(t.app, a.users.admin.email);
  op = await signIn(t.app, a.users.operator.email);
  const em = scoped(t.em(), a.orgId);
  unit = await makeMachine(em, a.orgId, 'HU1', 'hydraulic-unit');
  pumpHours = await makeMeter(em, a.orgId, unit, 'pump-hours');
  await makeMeter(em, a.orgId, unit, 'oil-temp', 'condition', '°C');
  cell = await makeMachine(em, a.orgId, 'C1', 'punch-plasma-cell');
  const torch = await makeMachine(em, a.orgId, 'C1-T', 'torch', cell);
  await makeMeter(em, a.orgId, torch, 'arc-starts', 'count', 'starts');
  await makePart(em, a.orgId, 'HF-20', 6, 'hydraulic-filter');
});
afterAll(() => t.close());

describe('starter plans', () => {
  it('every starter is well formed and names machine kinds', async () => {
    const res = await get(op, '/plan-starters').expect(200);
    expect(res.body.starters).toHaveLength(STARTER_PLANS.length);
    expect(new Set(STARTER_PLANS.map((s) => s.key)).size).toBe(STARTER_PLANS.length);
    for (const s of STARTER_PLANS) expect(s.triggers.length, s.key).toBeGreaterThan(0);
  });

  it('applies starters to a machine, finds meters on its components, plans parts, and explains what it skips', async () => {
    const res = await post(admin, '/plan-starters/apply', {
      machineId: unit,
      starterKeys: ['hyd-filters', 'oil-too-hot', 'oil-off-target', 'clamps', 'nope'],
    }).expect(201);
    expect(res.body.created.map((c: { key: string }) => c.key)).toEqual(['hyd-filters', 'oil-too-hot', 'oil-off-target']);
    expect(res.body.skipped).toEqual([
      { key: 'clamps', title: 'Inspect sheet clamps and clamp pads', reason: 'Meant for a punch/plasma cell; HU1 is a hydraulic unit' },
      { key: 'nope', title: 'nope', reason: 'No starter plan has this key' },
    ]);
    const plan = await get(admin, `/plans/${res.body.created[0].planId}`).expect(200);
    expect(plan.body).toMatchObject({ title: 'Replace hydraulic return and pressure filter elements', requiresLockout: true, starterKey: 'hyd-filters' });
    expect(plan.body.triggers.map((x: { summary: string }) => x.summary)).toEqual(['every 1,000 h of pump hours', '12 months after it was last done']);
    expect(plan.body.parts).toEqual([expect.objectContaining({ partNumber: 'HF-20', quantity: 2 })]);
    expect(plan.body.triggers[0].meterId).toBe(pumpHours);

    const cellRes = await post(admin, '/plan-starters/apply', { machineId: cell, starterKeys: ['electrode-nozzle', 'axis-lube', 'punch-sharpen'] }).expect(201);
    expect(cellRes.body.created.map((c: { key: string }) => c.key)).toEqual(['electrode-nozzle', 'axis-lube']);
    expect(cellRes.body.skipped).toEqual([
      { key: 'axis-lube', title: 'Grease ball screws and linear guides', reason: 'Created without its run-hours (h) trigger: C1 has no such meter' },
      { key: 'punch-sharpen', title: 'Sharpen punches and check die clearance', reason: 'C1 has no meter for hits (hits)' },
    ]);
    const again = await post(admin, '/plan-starters/apply', { machineId: unit, starterKeys: ['hyd-filters'] }).expect(201);
    expect(again.body.skipped[0].reason).toBe('Already applied to HU1');
    await post(op, '/plan-starters/apply', { machineId: unit, starterKeys: ['hyd-filters'] }).expect(403);
  });

  it('says before applying which starters fit a machine and why the others do not, and applying agrees', async () => {
    const brake = await makeMachine(scoped(t.em(), a.orgId), a.orgId, 'PB1', 'press-brake');
    const fitOf = async (key: string) => {
      const res = await get(op, `/plan-starters?machineId=${brake}`).expect(200);
      return res.body.starters.find((s: { key: string }) => s.key === key).fit;
    };
    expect(await fitOf('brake-guarding')).toEqual({ status: 'fits', reason: null });
    // No pump-hours meter on the brake: the oil change keeps only its calendar trigger.
    expect(await fitOf('hyd-oil-change')).toEqual({ status: 'partial', reason: 'Without its pump-hours (h) trigger: PB1 has no such meter' });
    expect(await fitOf('clamps')).toEqual({ status: 'no', reason: 'Meant for a punch/plasma cell; PB1 is a press brake' });
    // The list without a machine carries no fit.
    const plain = await get(op, '/plan-starters').expect(200);
    expect(plain.body.starters[0].fit).toBeUndefined();

    const res = await post(admin, '/plan-starters/apply', { machineId: brake, starterKeys: ['brake-guarding', 'hyd-oil-change'] }).expect(201);
    expect(res.body.created.map((c: { key: string }) => c.key)).toEqual(['brake-guarding', 'hyd-oil-change']);
    expect(res.body.skipped).toEqual([
      { key: 'hyd-oil-change', title: 'Renew hydraulic oil', reason: 'Created without its pump-hours (h) trigger: PB1 has no such meter' },
    ]);
    expect(await fitOf('brake-guarding')).toEqual({ status: 'no', reason: 'Already applied to PB1' });

    await get(op, '/plan-starters?machineId=00000000-0000-4000-8000-000000000000').expect(404);
    await get(op, '/plan-starters?machineId=nope').expect(400);
  });
});

describe('plan list and edit', () => {
  it('lists with filters and paging; an edit keeps existing meter baselines', async () => {
    const made = await post(
      admin,
      '/plans',
      planBody(unit, { title: 'Hours based check', triggers: [{ kind: 'meter', meterId: pumpHours, every: 250 }] }),
    ).expect(201);
    const list = await get(op, `/plans?machineId=${unit}&q=hours+based`).expect(200);
    expect(list.body.rows).toEqual([
      expect.objectContaining({ id: made.body.id, triggerSummary: 'every 250 h of pump hours', responsible: 'Maintenance technician' }),
    ]);
    const byStatus = await get(op, '/plans?status=overdue&pageSize=1').expect(200);
    expect(byStatus.body.rows.length).toBeLessThanOrEqual(1);
    await get(op, '/plans?status=later').expect(400);
    await put(
      admin,
      `/plans/${made.body.id}`,
      planBody(unit, { title: 'Hours based check (renamed)', triggers: [{ kind: 'meter', meterId: pumpHours, every: 300 }] }),
    ).expect(200);
    const after = await get(op, `/plans/${made.body.id}`).expect(200);
    expect(after.body.title).toBe('Hours based check (renamed)');
    expect(after.body.meterDue).toEqual([expect.objectContaining({ dueValue: 300 })]); // no reading yet: baseline 0 waits for the first reading
    await put(op, `/plans/${made.body.id}`, planBody(unit)).expect(403);
  });
});
