// Station records that do scheduled work: a consumable change, a test coupon or a counter reading
// named by a plan signs off the plan's open work order and restarts the plan from it.
import { describe, it, expect, beforeAll, afterAll, afterEach } from 'vitest';
import type { MikroORM } from '@mikro-orm/postgresql';
import { DateTime } from 'luxon';
import { setClock } from '../../shared/clock';
import { makeShop, makeTestApp, signIn, type SignedIn, type TestShop } from '../setup/test-app';
import { initORM } from '../../server/db';
import { runDueEngine } from '../../server/jobs/due-engine';
import { get, planBody, post } from './work-orders-fixtures';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let orm: MikroORM;
let a: TestShop;
let tech: SignedIn;
let op: SignedIn;
let admin: SignedIn;
let cell: string;
let torch: string;
let starts: string;
let unit: string;
let parts: Record<string, string>;

const T0 = '2026-03-02T06:00:00Z'; // a Monday
const at = (hours: number) => new Date(Date.parse(T0) + hours * 3600_000).toISOString();

async function openWork(planId: string) {
  const rows: { id: string; number: number; status: string }[] = await orm.em
    .fork()
    .execute(`select id, number, status from work_order where plan_id = ? order by number`, [planId]);
  return rows;
}

async function engine(now: string) {
  setClock(now);
  await runDueEngine(orm, new Date(now), { appUrl: t.config.APP_URL, orgId: a.orgId });
}

beforeAll(async () => {
  t = await makeTestApp();
  orm = await initORM();
  a = await makeShop(t.em(), 'station-work');
  tech = await signIn(t.app, a.users.technician.email);
  op = await signIn(t.app, a.users.operator.email);
  admin = await signIn(t.app, a.users.admin.email);
  setClock(T0);
  cell = (await post(tech, '/machines', { code: 'C1', name: 'Cell 1', kind: 'punch-plasma-cell' }).expect(201)).body.id;
  torch = (await post(tech, '/machines', { code: 'C1-T', name: 'Torch', kind: 'torch', parentId: cell }).expect(201)).body.id;
  starts = (await post(tech, '/meters', { machineId: torch, code: 'arc-starts', name: 'Arc starts', kind: 'count', unit: 'starts' }).expect(201)).body.id;
  unit = (await post(tech, '/machines', { code: 'HU1', name: 'Unit', kind: 'hydraulic-unit' }).expect(201)).body.id;
  parts = {};
  for (const [category, pn] of [
    ['electrode', 'EL-1'],
    ['nozzle', 'NZ-1'],
    ['swirl-ring', 'SR-1'],
  ]) {
    parts[category] = (
      await post(tech, '/part-types', {
        partNumber: pn,
        name: pn,
        category,
        lifeUnit: 'starts',
        expectedLife: 1000,
        unitCost: 5,
        leadTimeDays: 5,
        openingStock: 20,
      }).expect(201)
    ).body.id;
  }
  await post(op, `/meters/${starts}/readings`, { value: 0, readAt: T0 }).expect(201);
  // The first set goes in before any plan exists.
  await post(op, '/consumable-changes', {
    torchId: torch,
    categories: ['electrode', 'nozzle', 'swirl-ring'],
    partTypeIds: parts,
    reason: 'preventive',
    changedAt: T0,
  }).expect(201);
});
afterEach(() => setClock(null));
afterAll(() => t.close());

describe('a consumable change at the station does the plan that names it', () => {
  let planId: string;

  it('the starter check of electrode and nozzle names an electrode + nozzle change as its station record', async () => {
    setClock(at(1));
    const res = await post(admin, '/plan-starters/apply', { machineId: cell, starterKeys: ['electrode-nozzle'] }).expect(201);
    planId = res.body.created[0].planId;
    const plan = (await get(admin, `/plans/${planId}`).expect(200)).body;
    expect(plan.stationRecord).toMatchObject({
      kind: 'consumable-change',
      categories: ['electrode', 'nozzle'],
      summary: 'A consumable change of electrode + nozzle',
    });
    expect(plan.triggers[0]).toMatchObject({ kind: 'meter', meterId: starts, every: 800 });
  });

  it('the plan falls due on arc starts and the pass raises its work order', async () => {
    setClock(at(48));
    await post(op, `/meters/${starts}/readings`, { value: 900, readAt: at(48) }).expect(201);
    await engine(at(49));
    const work = await openWork(planId);
    expect(work).toHaveLength(1);
    expect(work[0].status).toBe('open');
    expect((await get(admin, `/plans/${planId}`).expect(200)).body.status).toMatch(/^(due|overdue)$/);
  });

  it('a change of other parts (swirl ring only) leaves the work open', async () => {
    setClock(at(50));
    const res = await post(op, '/consumable-changes', { torchId: torch, categories: ['swirl-ring'], reason: 'damaged', startsReading: 910 }).expect(201);
    expect(res.body.workOrders).toEqual([]);
    expect((await openWork(planId))[0].status).toBe('open');
    const plan = (await get(admin, `/plans/${planId}`).expect(200)).body;
    expect(plan.lastDoneAt).toBeNull();
    expect(plan.openWorkOrder).not.toBeNull();
  });

  it('an electrode + nozzle change signs the work off as done by the operator at the change, linked both ways, and the next due moves', async () => {
    setClock(at(52));
    const before = (await get(admin, `/plans/${planId}`).expect(200)).body;
    const [wo] = await openWork(planId);
    const changedAt = at(51.5);
    const res = await post(op, '/consumable-changes', {
      torchId: torch,
      categories: ['electrode', 'nozzle'],
      reason: 'normal-wear',
      startsReading: 950,
      pitDepthMm: 0.8,
      changedAt,
    }).expect(201);
    expect(res.body.workOrders).toEqual([{ id: wo.id, number: wo.number }]);

    const detail = (await get(tech, `/work-orders/${wo.id}`).expect(200)).body;
    expect(detail.status).toBe('done');
    expect(detail.completedAt).toBe(changedAt);
    expect(detail.completedBy.id).toBe(a.users.operator.userId);
    expect(detail.stationRecord).toEqual({
      type: 'ConsumableChange',
      id: res.body.id,
      summary: 'Consumable change on C1-T: electrode + nozzle; electrode pit 0.8 mm',
    });
    expect(detail.history.map((h: { action: string }) => h.action)).toContain('work-order.done-at-station');

    // The other half of the link: the change lists the work it did.
    const changes = (await get(op, `/consumable-changes?machineId=${cell}`).expect(200)).body.rows;
    expect(changes.find((c: { id: string }) => c.id === res.body.id).workOrders).toEqual([
      { id: wo.id, number: wo.number, title: 'Check electrode pit and nozzle bore' },
    ]);
    const station = (await get(op, '/stations/C1').expect(200)).body;
    expect(station.recentChanges[0].workOrders.map((w: { number: number }) => w.number)).toEqual([wo.number]);

    // The due engine counts it as last done: 800 starts from the 950 at the change.
    const after = (await get(admin, `/plans/${planId}`).expect(200)).body;
    expect(after.lastDoneAt).toBe(changedAt);
    expect(after.status).toBe('not-due');
    expect(after.openWorkOrder).toBeNull();
    expect(after.meterDue[0]).toMatchObject({ meterId: starts, dueValue: 1750, current: 950 });
    expect(before.meterDue[0].dueValue).toBe(800);
    // The next pass finds nothing to raise: the work is not entered twice.
    await engine(at(53));
    expect((await openWork(planId)).map((w) => w.status)).toEqual(['done']);
  });

  it('a change made before the work was raised does not sign off that later work', async () => {
    setClock(at(60));
    await post(op, `/meters/${starts}/readings`, { value: 1800, readAt: at(60) }).expect(201);
    await engine(at(61));
    const open = (await openWork(planId)).filter((w) => w.status === 'open');
    expect(open).toHaveLength(1);
    setClock(at(62));
    // Back-dated to before the work was raised (and before the 1,800 reading): the later work stays open.
    const res = await post(op, '/consumable-changes', { torchId: torch, categories: ['electrode', 'nozzle'], reason: 'normal-wear', changedAt: at(59) }).expect(
      201,
    );
    expect(res.body.workOrders).toEqual([]);
    expect((await openWork(planId)).find((w) => w.id === open[0].id)?.status).toBe('open');
  });
});

describe('a test coupon and a counter reading do the plans that name them', () => {
  it('the weekly coupon work is signed off by a cut check and its next due moves to the next week', async () => {
    setClock(at(2));
    const res = await post(admin, '/plan-starters/apply', { machineId: cell, starterKeys: ['cut-coupon'] }).expect(201);
    const planId = res.body.created[0].planId;
    // Tuesday 07:00 in the shop's zone has passed: the pass raises the coupon work.
    await engine(at(24 * 2));
    const [wo] = await openWork(planId);
    expect(wo?.status).toBe('open');
    const due = (await get(admin, `/plans/${planId}`).expect(200)).body.nextDueAt;
    setClock(at(24 * 2 + 1));
    const check = await post(op, '/cut-checks', { torchId: torch, dimensions: [{ label: 'Width', nominalMm: 100, measuredMm: 100.1 }] }).expect(201);
    expect(check.body.workOrders).toEqual([{ id: wo.id, number: wo.number, title: 'Cut and measure the weekly test coupon' }]);
    const detail = (await get(tech, `/work-orders/${wo.id}`).expect(200)).body;
    expect(detail).toMatchObject({ status: 'done', stationRecord: { type: 'CutCheck', id: check.body.id } });
    expect(detail.stationRecord.summary).toMatch(/^Test coupon on C1-T: within tolerance/);
    const after = (await get(admin, `/plans/${planId}`).expect(200)).body;
    // Weekly rule in the shop's zone: the next occurrence is the following Tuesday at 07:00 local
    // (RFC 5545 keeps the wall-clock time across a DST change, so the gap need not be 168 h).
    const local = (x: string) => DateTime.fromISO(x, { zone: after.timeZone });
    expect(local(after.nextDueAt).weekday).toBe(2);
    expect(local(after.nextDueAt).toFormat('HH:mm')).toBe('07:00');
    expect(local(after.nextDueAt).startOf('day').diff(local(due).startOf('day'), 'days').days).toBe(7);
  });

  it('a plan done by reading a counter is signed off by that reading, not by another meter', async () => {
    setClock(at(3));
    const hours = (await post(tech, '/meters', { machineId: unit, code: 'pump-hours', name: 'Pump hours', kind: 'running-time', unit: 'h' }).expect(201)).body
      .id;
    const temp = (await post(tech, '/meters', { machineId: unit, code: 'oil-temp', name: 'Oil temperature', kind: 'condition', unit: '°C' }).expect(201)).body
      .id;
    const plan = await post(
      admin,
      '/plans',
      planBody(unit, {
        title: 'Weekly pump hours',
        checklist: [],
        triggers: [{ kind: 'calendar-floating', every: 1, unit: 'week' }],
        stationRecord: { kind: 'counter-reading', meterId: hours },
      }),
    ).expect(201);
    await engine(at(24 * 8));
    const [wo] = await openWork(plan.body.id);
    expect(wo?.status).toBe('open');
    setClock(at(24 * 8 + 1));
    await post(op, '/meter-readings', { readings: [{ meterId: temp, value: 40 }] }).expect(201);
    expect((await openWork(plan.body.id))[0].status).toBe('open');
    await post(op, '/meter-readings', { readings: [{ meterId: hours, value: 120 }] }).expect(201);
    const detail = (await get(tech, `/work-orders/${wo.id}`).expect(200)).body;
    expect(detail).toMatchObject({ status: 'done', stationRecord: { type: 'MeterReading', summary: 'Reading of Pump hours: 120 h' } });
  });

  it('refuses a station record the machine cannot make, naming the field', async () => {
    const res = await post(admin, '/plans', planBody(unit, { stationRecord: { kind: 'consumable-change', categories: ['electrode'] } })).expect(400);
    expect(res.body.fields).toEqual([{ path: 'stationRecord.kind', message: 'HU1 has no torch' }]);
    const empty = await post(admin, '/plans', planBody(cell, { stationRecord: { kind: 'consumable-change', categories: [] } })).expect(400);
    expect(empty.body.fields[0].path).toBe('stationRecord.categories');
    const foreign = await post(admin, '/plans', planBody(unit, { stationRecord: { kind: 'counter-reading', meterId: starts } })).expect(400);
    expect(foreign.body.fields[0].path).toBe('stationRecord.meterId');
  });
});
