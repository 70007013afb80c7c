// The signed pre-use check at the start of a shift: one answer per line, signed on the safety
// chain; a failed safety-critical line stops the machine and raises its repair.
import { describe, it, expect, beforeAll, afterAll, afterEach } from 'vitest';
import type { MikroORM } from '@mikro-orm/postgresql';
import { makeTestApp, type SignedIn } from '../setup/test-app';
import { initORM } from '../../server/db';
import { setClock } from '../../shared/clock';
import { countSignOffs, get, makeSafetyShop, PASSWORD, post, type SafetyShop } from './safety-helpers';
import { makeMachine, makeMeter } from './work-orders-fixtures';
import { Machine } from '../../server/modules/machines/machine.entity';
import { Meter } from '../../server/modules/meters/meter.entity';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let orm: MikroORM;
let shop: SafetyShop;
let other: SafetyShop;
const machineIds: Record<string, string> = {};

beforeAll(async () => {
  t = await makeTestApp();
  orm = await initORM();
  shop = await makeSafetyShop(t.app, t.em(), 'preuse');
  other = await makeSafetyShop(t.app, t.em(), 'preuse-other');
  const em = t.em();
  for (const [code, kind] of [
    ['B1', 'press-brake'],
    ['B2', 'press-brake'],
    ['B3', 'press-brake'],
    ['F1', 'fume-extractor'],
    ['F2', 'fume-extractor'],
    ['H1', 'hydraulic-unit'],
  ] as const)
    machineIds[code] = await makeMachine(em, shop.orgId, code, kind);
  em.create(Machine, { organization: shop.orgId, code: 'B9', name: 'Old brake', kind: 'press-brake', active: false });
  await em.flush();
});
afterEach(() => setClock(null));
afterAll(async () => {
  await orm.close();
  await t.close();
});

const brakeOk = [
  { code: 'light-curtain', ok: true },
  { code: 'foot-pedal', ok: true },
  { code: 'die-clamps', ok: true },
];
const sign = (who: SignedIn, code: string, answers: unknown[], password = PASSWORD) => post(who, `/machines/${code}/pre-use-checks`, { answers, password });
const count = async (sql: string, params: unknown[]) => Number((await orm.em.fork().execute<{ n: string }[]>(sql, params))[0].n);
const checksOf = (orgId: string) => count('select count(*) as n from machine_pre_use_check where organization_id = ?', [orgId]);
const workOrdersOf = (orgId: string) => count('select count(*) as n from work_order where organization_id = ?', [orgId]);

describe('pre-use checks', () => {
  it('lists the press brake lines with the safety-critical ones marked, due until signed', async () => {
    setClock('2027-04-06T14:00:00Z');
    const view = await get(shop.s.operator, '/machines/B1/pre-use-checks').expect(200);
    expect(view.body.lines.map((l: { code: string; safetyCritical: boolean }) => [l.code, l.safetyCritical])).toEqual([
      ['light-curtain', true],
      ['foot-pedal', true],
      ['die-clamps', false],
    ]);
    expect(view.body).toMatchObject({ dueToday: true, checkedToday: false, history: [] });
    // A kind without a list reads as no list, not an error.
    expect((await get(shop.s.operator, '/machines/H1/pre-use-checks').expect(200)).body.lines).toBeNull();
  });

  it('all lines OK: signed on the safety chain, machine stays in service, nothing raised, no longer due today', async () => {
    setClock('2027-04-06T14:05:00Z');
    const signOffsBefore = await countSignOffs(shop.orgId);
    const wosBefore = await workOrdersOf(shop.orgId);
    const res = await sign(shop.s.operator, 'B1', brakeOk).expect(201);
    expect(res.body).toMatchObject({ pass: true, safetyCriticalFailed: false, workOrderId: null, status: { state: 'in-service' } });
    expect(await countSignOffs(shop.orgId)).toBe(signOffsBefore + 1);
    expect(await workOrdersOf(shop.orgId)).toBe(wosBefore);
    const [so] = await orm.em
      .fork()
      .execute<{ meaning: string; subject_id: string }[]>(`select meaning, subject_id from safety_sign_off where id = ?`, [res.body.signOffId]);
    expect(so).toEqual({ meaning: 'pre-use-check-done', subject_id: res.body.id });
    const chain = await get(shop.s.safety, '/safety/chain/verify').expect(200);
    expect(chain.body.ok).toBe(true);
    const view = await get(shop.s.operator, '/machines/B1/pre-use-checks').expect(200);
    expect(view.body).toMatchObject({ dueToday: false, checkedToday: true });
    expect(view.body.history[0]).toMatchObject({ id: res.body.id, pass: true, checkedBy: expect.stringContaining('operator') });
  });

  it('a failed safety-critical line takes the machine out of service and raises the repair, linked to the stop', async () => {
    setClock('2027-04-06T14:10:00Z');
    const res = await sign(shop.s.operator, 'B2', [
      { code: 'light-curtain', ok: false },
      { code: 'foot-pedal', ok: true },
      { code: 'die-clamps', ok: true },
    ]).expect(201);
    expect(res.body).toMatchObject({ pass: false, safetyCriticalFailed: true, status: { state: 'out-of-service' } });
    expect(res.body.workOrderNumber).toBeGreaterThan(0);
    const [wo] = await orm.em
      .fork()
      .execute<{ kind: string; title: string; status: string; machine_code: string }[]>(
        `select w.kind, w.title, w.status, m.code as machine_code from work_order w join machine m on m.id = w.machine_id where w.id = ?`,
        [res.body.workOrderId],
      );
    expect(wo).toMatchObject({ kind: 'corrective', machine_code: 'B2' });
    expect(wo.title).toContain('Pre-use check failed');
    const [down] = await orm.em
      .fork()
      .execute<{ work_order_id: string; ended_at: string | null }[]>(
        `select d.work_order_id, d.ended_at from machine_downtime d join machine m on m.id = d.machine_id where m.code = 'B2' and m.organization_id = ?`,
        [shop.orgId],
      );
    expect(down).toEqual({ work_order_id: res.body.workOrderId, ended_at: null });
    const status = await get(shop.s.technician, '/machines/B2/status').expect(200);
    expect(status.body.state).toBe('out-of-service');
  });

  it('a failed line that is not safety-critical raises the repair but leaves the machine in service', async () => {
    const wosBefore = await workOrdersOf(shop.orgId);
    const res = await sign(shop.s.operator, 'B3', [
      { code: 'light-curtain', ok: true },
      { code: 'foot-pedal', ok: true },
      { code: 'die-clamps', ok: false },
    ]).expect(201);
    expect(res.body).toMatchObject({ pass: false, safetyCriticalFailed: false, status: { state: 'in-service' } });
    expect(await workOrdersOf(shop.orgId)).toBe(wosBefore + 1);

    // Found again on the next check while its repair is open: linked to that repair, no second one.
    const again = await sign(shop.s.operator, 'B3', [
      { code: 'light-curtain', ok: true },
      { code: 'foot-pedal', ok: true },
      { code: 'die-clamps', ok: false },
    ]).expect(201);
    expect(again.body.workOrderId).toBe(res.body.workOrderId);
    expect(await workOrdersOf(shop.orgId)).toBe(wosBefore + 1);

    // Once that repair is closed, the same failure raises a new one.
    await orm.em.fork().execute(`update work_order set status = 'cancelled' where id = ?`, [res.body.workOrderId]);
    const afterClose = await sign(shop.s.operator, 'B3', [
      { code: 'light-curtain', ok: true },
      { code: 'foot-pedal', ok: true },
      { code: 'die-clamps', ok: false },
    ]).expect(201);
    expect(afterClose.body.workOrderId).not.toBe(res.body.workOrderId);
    expect(await workOrdersOf(shop.orgId)).toBe(wosBefore + 2);
  });

  it('a pressure drop over the limit fails its line; the machine’s own meter limit replaces the default', async () => {
    const over = await sign(shop.s.operator, 'F1', [
      { code: 'spark-arrestor', ok: true },
      { code: 'pressure-drop', ok: true, value: 1800 },
    ]).expect(201);
    const line = over.body.lines.find((l: { code: string }) => l.code === 'pressure-drop');
    // 1500 Pa default cartridge change point (from memory, shared/domain/pre-use-checks.ts)
    expect(line).toMatchObject({ ok: false, value: 1800, problem: '1800 Pa is above the 1500 Pa limit' });
    expect(over.body.status.state).toBe('in-service');

    const em = t.em();
    const meterId = await makeMeter(em, shop.orgId, machineIds.F2, 'filter-dp', 'condition', 'Pa');
    (await em.findOneOrFail(Meter, meterId, { filters: false })).upperLimit = 2000;
    await em.flush();
    const within = await sign(shop.s.operator, 'F2', [
      { code: 'spark-arrestor', ok: true },
      { code: 'pressure-drop', ok: true, value: 1800 },
    ]).expect(201);
    expect(within.body.pass).toBe(true);
  });

  it('refuses a missing reading, a missing line and an unknown line, naming the field, and writes nothing', async () => {
    const before = { checks: await checksOf(shop.orgId), signOffs: await countSignOffs(shop.orgId) };
    const noValue = await sign(shop.s.operator, 'F1', [
      { code: 'spark-arrestor', ok: true },
      { code: 'pressure-drop', ok: true },
    ]).expect(400);
    expect(noValue.body.fields[0].path).toBe('answers.1.value');
    const missing = await sign(shop.s.operator, 'B1', brakeOk.slice(0, 2)).expect(400);
    expect(missing.body.fields[0]).toMatchObject({ path: 'answers', message: expect.stringContaining('Upper and lower die clamps') });
    const unknown = await sign(shop.s.operator, 'B1', [...brakeOk, { code: 'water-level', ok: true }]).expect(400);
    expect(unknown.body.fields[0].path).toBe('answers.3.code');
    const wrongPassword = await sign(shop.s.operator, 'B1', brakeOk, 'not-my-password').expect(401);
    expect(wrongPassword.body.fields[0].path).toBe('password');
    expect({ checks: await checksOf(shop.orgId), signOffs: await countSignOffs(shop.orgId) }).toEqual(before);
  });

  it('another shop’s machine is 404, a kind without a list 400 naming the code, a deactivated machine 409', async () => {
    await sign(other.s.operator, 'B1', brakeOk).expect(404);
    await get(other.s.operator, '/machines/B1/pre-use-checks').expect(404);
    const noList = await sign(shop.s.operator, 'H1', [{ code: 'guards', ok: true }]).expect(400);
    expect(noList.body.fields).toEqual([{ path: 'code', message: 'No pre-use check for a hydraulic unit' }]);
    const off = await sign(shop.s.operator, 'B9', brakeOk).expect(409);
    expect(off.body.error).toBe('conflict');
    expect(off.body.fields[0].path).toBe('code');
  });

  it('a retry with the same Idempotency-Key records one check and replays the answer', async () => {
    const before = await checksOf(shop.orgId);
    const send = () =>
      shop.s.operator.agent
        .post('/api/machines/B1/pre-use-checks')
        .set('X-CSRF-Token', shop.s.operator.csrf)
        .set('Idempotency-Key', `pre-use-${process.pid}-${Date.now()}`)
        .send({ answers: brakeOk, password: PASSWORD });
    const key = `pre-use-${process.pid}-retry`;
    const first = await shop.s.operator.agent
      .post('/api/machines/B1/pre-use-checks')
      .set('X-CSRF-Token', shop.s.operator.csrf)
      .set('Idempotency-Key', key)
      .send({ answers: brakeOk, password: PASSWORD })
      .expect(201);
    const retry = await shop.s.operator.agent
      .post('/api/machines/B1/pre-use-checks')
      .set('X-CSRF-Token', shop.s.operator.csrf)
      .set('Idempotency-Key', key)
      .send({ answers: brakeOk, password: PASSWORD })
      .expect(201);
    expect(retry.headers['idempotent-replayed']).toBe('true');
    expect(retry.body.id).toBe(first.body.id);
    expect(await checksOf(shop.orgId)).toBe(before + 1);
    await send().expect(201);
    expect(await checksOf(shop.orgId)).toBe(before + 2);
  });

  it('the compliance summary shows machines in service with a list and no check since the shop’s day began', async () => {
    // 7 April 05:30 UTC is 00:30 in the shop's zone (America/Chicago, CDT = UTC−5 from March to
    // November every year, IANA tzdb): a new shop day, so yesterday's checks no longer count. Next
    // year's 7 April, so the checks the tests above signed at the real time are always before it.
    const year = new Date().getUTCFullYear() + 1;
    setClock(`${year}-04-07T05:30:00Z`);
    const before = (await get(shop.s.safety, '/safety/audit/compliance?days=7').expect(200)).body;
    const row = (body: { machines: { machineCode: string }[] }, code: string) => body.machines.find((m) => m.machineCode === code) as Record<string, unknown>;
    expect(row(before, 'B1')).toMatchObject({ preUseNeeded: true, preUseMissed: true });
    // Out of service (B2), no list (H1): nothing to miss.
    expect(row(before, 'B2')).toMatchObject({ preUseNeeded: false, preUseMissed: false });
    expect(row(before, 'H1')).toMatchObject({ preUseNeeded: false, preUseMissed: false });
    await sign(shop.s.operator, 'B1', brakeOk).expect(201);
    const after = (await get(shop.s.safety, '/safety/audit/compliance?days=7').expect(200)).body;
    expect(row(after, 'B1')).toMatchObject({
      preUseNeeded: true,
      preUseMissed: false,
      lastPreUseCheckAt: expect.stringMatching(new RegExp(`^${year}-04-07T05:3`)),
    });
    expect(after.totals.missedPreUseChecks).toBe(before.totals.missedPreUseChecks - 1);
    // 04:59 UTC the next day is still 23:59 on 7 April in the shop: signed today, not missed.
    setClock(`${year}-04-08T04:59:00Z`);
    expect(row((await get(shop.s.safety, '/safety/audit/compliance?days=7').expect(200)).body, 'B1').preUseMissed).toBe(false);
    setClock(`${year}-04-08T05:01:00Z`);
    expect(row((await get(shop.s.safety, '/safety/audit/compliance?days=7').expect(200)).body, 'B1').preUseMissed).toBe(true);
  });
});
