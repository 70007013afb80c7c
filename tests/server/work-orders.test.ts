import { describe, it, expect, beforeAll, afterAll, afterEach } from 'vitest';
import { DateTime } from 'luxon';
import { clock, setClock } from '../../shared/clock';
import type { MikroORM } from '@mikro-orm/postgresql';
import { makeShop, makeTestApp, signIn, type SignedIn, type TestShop } from '../setup/test-app';
import { initORM } from '../../server/db';
import { runDueEngine } from '../../server/jobs/due-engine';
import { markLockoutApplied, markLockoutReleased } from '../../server/modules/work-orders/work-order-lockout';
import { PartType, StockMove } from '../../server/modules/stock/stock.entity';
import { WorkOrderPart } from '../../server/modules/work-orders/work-order.entity';
import { MaintenancePlan } from '../../server/modules/plans/plan.entity';
import { WORK_CAUTION } from '../../shared/domain/cautions';
import { addReadings, del, drainOutbox, get, makeMachine, makeMeter, makePart, patch, pendingMails, planBody, post, put, scoped } from './work-orders-fixtures';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let orm: MikroORM;
let a: TestShop;
let b: TestShop;
let admin: SignedIn;
let tech: SignedIn;
let op: SignedIn;
let otherAdmin: SignedIn;
let unit: string;
let otherUnit: string;
let pumpHours: string;
let filter: string;

/** A plan raised into an open work order at `now`; returns both ids. */
async function raisedWork(over: Record<string, unknown> = {}, startedAt = '2026-03-01T06:00:00Z', now = '2026-03-08T07:00:00Z') {
  const res = await post(admin, '/plans', planBody(unit, { triggers: [{ kind: 'calendar-floating', every: 1, unit: 'week' }], ...over }));
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  const planId = res.body.id as string;
  await orm.em.fork().execute(`update maintenance_plan set started_at = ?, recheck_at = null where id = ?`, [new Date(startedAt), planId]);
  await runDueEngine(orm, new Date(now), { appUrl: t.config.APP_URL, orgId: a.orgId });
  const [wo]: { id: string }[] = await orm.em.fork().execute(`select id from work_order where plan_id = ?`, [planId]);
  expect(wo, 'work order raised').toBeTruthy();
  return { planId, woId: wo.id };
}

const answerAll = (s: SignedIn, woId: string) =>
  put(s, `/work-orders/${woId}/checklist`, {
    results: [
      { key: 'isolated', result: 'pass' },
      { key: 'dp', result: 'pass', value: 0.4 },
    ],
  });

beforeAll(async () => {
  t = await makeTestApp();
  orm = await initORM();
  a = await makeShop(t.em(), 'wo-a');
  b = await makeShop(t.em(), 'wo-b');
  admin = await signIn(t.app, a.users.admin.email);
  tech = await signIn(t.app, a.users.technician.email);
  op = await signIn(t.app, a.users.operator.email);
  otherAdmin = await signIn(t.app, b.users.admin.email);
  const em = scoped(t.em(), a.orgId);
  unit = await makeMachine(em, a.orgId, 'HU1');
  pumpHours = await makeMeter(em, a.orgId, unit, 'pump-hours');
  await addReadings(em, a.orgId, pumpHours, [{ at: '2026-01-01T08:00:00Z', value: 1000 }]);
  filter = await makePart(em, a.orgId, 'HF-10', 3);
  otherUnit = await makeMachine(scoped(t.em(), b.orgId), b.orgId, 'HU9');
});
afterEach(() => setClock(null));
afterAll(() => t.close());

describe('plans: bad input gets a clear error and nothing is written', () => {
  const count = async () => orm.em.fork().count(MaintenancePlan, { organization: a.orgId }, { filters: false });

  it('an invalid RRULE and a start inside the spring-forward gap are field errors', async () => {
    const before = await count();
    const res = await post(
      admin,
      '/plans',
      planBody(unit, {
        triggers: [
          { kind: 'calendar-fixed', start: '2026-03-09T07:00', rrule: 'FREQ=WEEKLY;BYDAY=XX' },
          // 8 March 2026, 02:30 does not exist in America/Chicago (clocks go 02:00 → 03:00).
          { kind: 'calendar-fixed', start: '2026-03-08T02:30', rrule: 'FREQ=WEEKLY;BYDAY=SU' },
        ],
      }),
    ).expect(400);
    expect(res.body.fields).toEqual([
      { path: 'triggers.0.rrule', message: 'BYDAY value "XX" is not [+/-n]MO..SU' },
      { path: 'triggers.1.start', message: expect.stringMatching(/does not exist in America\/Chicago/) },
    ]);
    expect(await count()).toBe(before);
  });

  it('a meter interval must be greater than zero; a condition needs a limit', async () => {
    const res = await post(
      admin,
      '/plans',
      planBody(unit, {
        triggers: [
          { kind: 'meter', meterId: pumpHours, every: 0 },
          { kind: 'condition', meterId: pumpHours },
        ],
      }),
    ).expect(400);
    expect(res.body.fields.map((f: { path: string }) => f.path)).toEqual(['triggers.0.every', 'triggers.1.above']);
    expect(res.body.fields[0].message).toBe('The meter interval must be greater than 0');
  });

  it('a condition trigger on a counter and a checklist measure without unit are refused', async () => {
    const res = await post(
      admin,
      '/plans',
      planBody(unit, { checklist: [{ key: 'x', label: 'Pressure', kind: 'measure' }], triggers: [{ kind: 'condition', meterId: pumpHours, above: 10 }] }),
    ).expect(400);
    expect(res.body.fields).toEqual([{ path: 'checklist.0.unit', message: 'A measured value needs a unit' }]);
    const res2 = await post(admin, '/plans', planBody(unit, { triggers: [{ kind: 'condition', meterId: pumpHours, above: 10 }] })).expect(400);
    expect(res2.body.fields).toEqual([{ path: 'triggers.0.meterId', message: 'pump hours is a counter; a condition trigger needs a condition reading' }]);
  });

  it('a plan on another shop’s machine, or reading another shop’s meter, is not found', async () => {
    const before = await count();
    await post(admin, '/plans', planBody(otherUnit)).expect(404);
    const m = await post(otherAdmin, '/plans', planBody(otherUnit, { triggers: [{ kind: 'meter', meterId: pumpHours, every: 100 }] })).expect(404);
    expect(m.body.message).toBe('Meter not found');
    expect(await count()).toBe(before);
    await post(op, '/plans', planBody(unit)).expect(403);
  });
});

describe('work order lifecycle', () => {
  it('refuses to close with an incomplete checklist, naming the open lines, and changes nothing', async () => {
    const { woId } = await raisedWork();
    await put(tech, `/work-orders/${woId}/checklist`, { results: [{ key: 'isolated', result: 'pass' }] }).expect(200);
    const res = await post(tech, `/work-orders/${woId}/close`, { labourMinutes: 30 }).expect(409);
    expect(res.body.error).toBe('checklist_incomplete');
    expect(res.body.message).toMatch(/cannot be signed off yet: 1 of 2 checklist lines have no answer: Filter pressure drop after start/);
    expect(res.body.fields).toEqual([{ path: 'checklist.1', message: '“Filter pressure drop after start” has no answer' }]);
    const wo = await get(tech, `/work-orders/${woId}`).expect(200);
    expect(wo.body).toMatchObject({ status: 'in-progress', labourMinutes: 0, completedAt: null });
    expect(wo.body.closeBlockers).toEqual([
      { code: 'checklist_incomplete', message: '1 of 2 checklist lines have no answer: Filter pressure drop after start' },
    ]);
  });

  it('a measured value outside its limits cannot be marked OK', async () => {
    const { woId } = await raisedWork();
    const res = await put(tech, `/work-orders/${woId}/checklist`, { results: [{ key: 'dp', result: 'pass', value: 2.2 }] }).expect(400);
    expect(res.body.fields).toEqual([{ path: 'results.0.result', message: '2.2 bar is outside 0…1.5 bar: mark “Filter pressure drop after start” Not OK' }]);
    await put(tech, `/work-orders/${woId}/checklist`, { results: [{ key: 'dp', result: 'fail', value: 2.2, note: 'element in bypass' }] }).expect(200);
    const wo = await get(tech, `/work-orders/${woId}`).expect(200);
    expect(wo.body.checklist[1]).toMatchObject({ result: 'fail', value: 2.2, note: 'element in bypass' });
  });

  it('takes parts from stock, refuses more than is on hand with nothing written, and returns them', async () => {
    const { woId } = await raisedWork();
    await post(tech, `/work-orders/${woId}/parts`, { partTypeId: filter, quantity: 2 }).expect(201);
    const em = scoped(t.em(), a.orgId);
    expect((await em.findOneOrFail(PartType, filter)).onHand).toBe(1);
    const moves = await em.count(StockMove, { partType: filter });
    const lines = await em.count(WorkOrderPart, { workOrder: woId });
    const res = await post(tech, `/work-orders/${woId}/parts`, { partTypeId: filter, quantity: 2 }).expect(400);
    expect(res.body.message).toBe('Not enough Part HF-10 (HF-10) in stock: 1 pcs on hand, 2 needed');
    expect(res.body.fields).toEqual([{ path: 'quantity', message: 'Only 1 pcs of Part HF-10 in stock' }]);
    const em2 = scoped(t.em(), a.orgId);
    expect((await em2.findOneOrFail(PartType, filter)).onHand).toBe(1);
    expect(await em2.count(StockMove, { partType: filter })).toBe(moves);
    expect(await em2.count(WorkOrderPart, { workOrder: woId })).toBe(lines);

    const wo = await get(tech, `/work-orders/${woId}`).expect(200);
    expect(wo.body.partsUsed).toEqual([expect.objectContaining({ partNumber: 'HF-10', quantity: 2, by: `technician of ${a.slug}` })]);
    await del(tech, `/work-orders/${woId}/parts/${wo.body.partsUsed[0].id}`).expect(200);
    expect((await scoped(t.em(), a.orgId).findOneOrFail(PartType, filter)).onHand).toBe(3);
    await post(op, `/work-orders/${woId}/parts`, { partTypeId: filter, quantity: 1 }).expect(403);
  });

  it('needs the lockout released before closing work that requires one; completion moves the floating schedule', async () => {
    // Signed off on the Wednesday before the shop's spring DST change, so its week is 167 hours long.
    setClock('2027-03-10T15:00:00Z');
    const { woId, planId } = await raisedWork({ requiresLockout: true });
    await answerAll(tech, woId).expect(200);
    const refused = await post(tech, `/work-orders/${woId}/close`, {}).expect(409);
    expect(refused.body.message).toMatch(/needs a lockout: apply it and release it in the safety log before signing off/);

    const sessionId = '6f1c2a4e-1d2b-4c3d-9e8f-0a1b2c3d4e5f';
    await orm.em.fork().transactional(async (em) => {
      em.setFilterParams('org', { orgId: a.orgId });
      await markLockoutApplied(em, woId, sessionId);
    });
    const stillOn = await post(tech, `/work-orders/${woId}/close`, {}).expect(409);
    expect(stillOn.body.message).toMatch(/has not been released in the safety log yet/);
    // Another shop's transaction cannot touch this work order.
    await expect(
      orm.em.fork().transactional(async (em) => {
        em.setFilterParams('org', { orgId: b.orgId });
        await markLockoutReleased(em, woId, clock.now());
      }),
    ).rejects.toThrow('Work order not found');
    await orm.em.fork().transactional(async (em) => {
      em.setFilterParams('org', { orgId: a.orgId });
      await markLockoutReleased(em, woId, clock.now());
    });
    const closed = await post(tech, `/work-orders/${woId}/close`, { labourMinutes: 55, notes: 'Element was loaded.' }).expect(200);
    const plan = await get(admin, `/plans/${planId}`).expect(200);
    // Floating weekly: next due one week after the completion on the site's wall clock (luxon's
    // calendar arithmetic in the zone), which across the DST change is 167 h, not 7 × 24 h.
    const done = DateTime.fromISO(plan.body.lastDoneAt, { zone: 'America/Chicago' });
    expect(Math.abs(done.toMillis() - Date.parse('2027-03-10T15:00:00Z'))).toBeLessThan(60_000); // 09:00 in the shop
    expect(plan.body.nextDueAt).toBe(done.plus({ weeks: 1 }).toUTC().toISO());
    expect(new Date(plan.body.nextDueAt).getTime() - done.toMillis()).toBe(167 * 3_600_000);
    expect(closed.body.planNextDueAt).toBe(plan.body.nextDueAt);
    expect(plan.body.status).toBe('not-due');
    expect(plan.body.openWorkOrder).toBeNull();
    const wo = await get(tech, `/work-orders/${woId}`).expect(200);
    expect(wo.body).toMatchObject({ status: 'done', labourMinutes: 55, notes: 'Element was loaded.', lockoutSessionId: sessionId });
    expect(wo.body.history.map((h: { action: string }) => h.action)).toEqual(
      expect.arrayContaining(['work-order.raised', 'work-order.checklist', 'work-order.closed']),
    );
    await post(tech, `/work-orders/${woId}/move`, { move: 'start' }).expect(409);
  });

  it('completion moves a meter baseline to the current reading', async () => {
    const res = await post(
      admin,
      '/plans',
      planBody(unit, { title: 'Pump hours filter', triggers: [{ kind: 'meter', meterId: pumpHours, every: 500 }] }),
    ).expect(201);
    const planId = res.body.id as string;
    // Baseline 1000 h (latest reading when the plan was made); 1 600 h later on → due at 1 500 h.
    await addReadings(scoped(t.em(), a.orgId), a.orgId, pumpHours, [{ at: '2026-02-01T08:00:00Z', value: 1600 }]);
    await runDueEngine(orm, new Date('2026-02-01T09:00:00Z'), { appUrl: t.config.APP_URL, orgId: a.orgId });
    const [wo]: { id: string; occurrence_key: string }[] = await orm.em.fork().execute(`select id, occurrence_key from work_order where plan_id = ?`, [planId]);
    expect(wo.occurrence_key).toBe(`meter:${pumpHours}:1500`);
    await answerAll(tech, wo.id).expect(200);
    await post(tech, `/work-orders/${wo.id}/close`, { labourMinutes: 20 }).expect(200);
    const plan = await get(admin, `/plans/${planId}`).expect(200);
    expect(plan.body.meterDue).toEqual([expect.objectContaining({ meterId: pumpHours, dueValue: 2100, current: 1600 })]);
    // No reading has reached 2 100 h, so it is not due; January's rate (600 h in 31 days) forecasts
    // 2 100 h 25.8 days after 1 Feb 08:00Z (27 Feb), already behind today's clock: "coming up".
    expect(plan.body.status).toBe('due-soon');
    expect(plan.body.meterDue[0].forecastAt.slice(0, 10)).toBe('2026-02-27');
  });

  it('moves through its states with reasons and refuses moves that do not apply', async () => {
    const { woId } = await raisedWork();
    await post(tech, `/work-orders/${woId}/move`, { move: 'pause' }).expect(400);
    await post(tech, `/work-orders/${woId}/move`, { move: 'start' }).expect(200);
    await post(tech, `/work-orders/${woId}/move`, { move: 'pause', reason: 'Waiting for seals' }).expect(200);
    let wo = await get(tech, `/work-orders/${woId}`).expect(200);
    expect(wo.body).toMatchObject({ status: 'on-hold', holdReason: 'Waiting for seals' });
    const bad = await post(tech, `/work-orders/${woId}/move`, { move: 'pause', reason: 'again' }).expect(409);
    expect(bad.body.message).toBe('WO ' + wo.body.number + ' is Paused; “pause” only applies to work that is Waiting or Under way');
    await post(tech, `/work-orders/${woId}/move`, { move: 'resume' }).expect(200);
    await post(tech, `/work-orders/${woId}/move`, { move: 'cancel' }).expect(400);
    await post(tech, `/work-orders/${woId}/move`, { move: 'cancel', reason: 'Unit scrapped' }).expect(200);
    wo = await get(tech, `/work-orders/${woId}`).expect(200);
    expect(wo.body).toMatchObject({ status: 'cancelled', cancelReason: 'Unit scrapped' });
    await post(op, `/work-orders/${woId}/move`, { move: 'start' }).expect(403);
  });

  it('another shop’s work order is not found', async () => {
    const { woId } = await raisedWork();
    await get(otherAdmin, `/work-orders/${woId}`).expect(404);
    await post(otherAdmin, `/work-orders/${woId}/close`, {}).expect(404);
    const list = await get(otherAdmin, '/work-orders').expect(200);
    expect(list.body.rows.find((r: { id: string }) => r.id === woId)).toBeUndefined();
  });
});

describe('repair work raised by hand, lists and attachments', () => {
  it('an operator reports a fault; the technicians get a cautioned notice', async () => {
    await drainOutbox(orm);
    const res = await post(op, '/work-orders', {
      machineId: unit,
      title: 'Hose weeping at the pump outlet',
      instructions: 'Seen at start of shift.',
      requiresLockout: true,
    }).expect(201);
    const mails = await pendingMails(orm, a.orgId);
    expect(mails.map((m) => m.toAddress)).toEqual([a.users.technician.email]);
    expect(mails[0].subject).toBe(`New work: WO ${res.body.number} Hose weeping at the pump outlet on HU1`);
    expect(mails[0].textBody).toContain(WORK_CAUTION);
    const bad = await post(op, '/work-orders', { machineId: unit, title: 'x' }).expect(400);
    expect(bad.body.fields).toEqual([{ path: 'title', message: 'Describe the problem in at least 3 characters' }]);
    await post(op, '/work-orders', { machineId: otherUnit, title: 'Not ours' }).expect(404);
  });

  it('lists with server paging and filters by machine, status, due, assignee and plan', async () => {
    const { woId, planId } = await raisedWork({ title: 'Filter for list test' });
    const byPlan = await get(tech, `/work-orders?planId=${planId}`).expect(200);
    expect(byPlan.body.rows.map((r: { id: string }) => r.id)).toEqual([woId]);
    const mine = await get(tech, '/work-orders?assignee=me&status=active&pageSize=2&sort=number&dir=desc').expect(200);
    expect(mine.body.rows.length).toBeLessThanOrEqual(2);
    expect(mine.body.total).toBeGreaterThan(2);
    const page2 = await get(tech, '/work-orders?assignee=me&status=active&pageSize=2&page=2&sort=number&dir=desc').expect(200);
    expect(page2.body.rows[0].number).toBeLessThan(mine.body.rows[1].number);
    const overdue = await get(tech, `/work-orders?due=overdue&machineId=${unit}`).expect(200);
    expect(overdue.body.rows.every((r: { dueState: string }) => r.dueState === 'overdue')).toBe(true);
    await get(tech, '/work-orders?due=someday').expect(400);
    await patch(tech, `/work-orders/${woId}`, { assigneeId: a.users.technician.userId }).expect(200);
    const assigned = await get(admin, `/work-orders?assignee=${a.users.technician.userId}`).expect(200);
    expect(assigned.body.rows.map((r: { id: string }) => r.id)).toContain(woId);
    await patch(tech, `/work-orders/${woId}`, { assigneeId: b.users.technician.userId }).expect(400);
  });

  it('keeps photos and PDFs checked by content and size; refuses anything else', async () => {
    const { woId } = await raisedWork();
    // Smallest valid PNG (1×1 pixel).
    const png = Buffer.from('iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mP8z8BQDwAEhQGAhKmMIQAAAABJRU5ErkJggg==', 'base64');
    const up = await tech.agent.post(`/api/work-orders/${woId}/attachments`).set('X-CSRF-Token', tech.csrf).attach('file', png, 'pit.png').expect(201);
    const file = await get(op, `/work-orders/${woId}/attachments/${up.body.id}`).expect(200);
    expect(file.headers['content-type']).toBe('image/png');
    expect(Buffer.compare(file.body as Buffer, png)).toBe(0);
    const fake = await tech.agent
      .post(`/api/work-orders/${woId}/attachments`)
      .set('X-CSRF-Token', tech.csrf)
      .attach('file', Buffer.from('#!/bin/sh\necho hi\n'), 'photo.png')
      .expect(400);
    expect(fake.body.fields).toEqual([{ path: 'file', message: 'Not a photo or PDF' }]);
    const big = Buffer.concat([png, Buffer.alloc(9 * 1024 * 1024)]);
    const tooBig = await tech.agent.post(`/api/work-orders/${woId}/attachments`).set('X-CSRF-Token', tech.csrf).attach('file', big, 'big.png').expect(413);
    expect(tooBig.body.message).toBe('The file is larger than 8 MB');
    const wo = await get(tech, `/work-orders/${woId}`).expect(200);
    expect(wo.body.attachments).toEqual([expect.objectContaining({ fileName: 'pit.png', mimeType: 'image/png', size: png.length })]);
    const pdf = await get(tech, `/work-orders/${woId}/pdf`).expect(200);
    expect(pdf.headers['content-type']).toBe('application/pdf');
    expect((pdf.body as Buffer).subarray(0, 5).toString()).toBe('%PDF-');
  });
});
