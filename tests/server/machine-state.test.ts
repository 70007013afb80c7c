import { describe, it, expect, beforeAll, afterAll, afterEach } from 'vitest';
import type { MikroORM } from '@mikro-orm/postgresql';
import { makeTestApp } from '../setup/test-app';
import { initORM } from '../../server/db';
import { setClock } from '../../shared/clock';
import { approvedProcedure, get, lockPoints, makeSafetyShop, PASSWORD, post, type SafetyShop } from './safety-helpers';
import { pendingMails } from './work-orders-fixtures';
import { patch } from '../setup/test-app';
import { WORK_CAUTION } from '../../shared/domain/cautions';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let orm: MikroORM;
let shop: SafetyShop;
let other: SafetyShop;

beforeAll(async () => {
  t = await makeTestApp();
  orm = await initORM();
  shop = await makeSafetyShop(t.app, t.em(), 'state');
  other = await makeSafetyShop(t.app, t.em(), 'state-other');
});
afterEach(() => setClock(null));
afterAll(async () => {
  await orm.close();
  await t.close();
});

const downtimes = async (machineId: string) =>
  orm.em.fork().execute<
    {
      kind: string;
      reason: string;
      started_at: string;
      ended_at: string | null;
      ended_by_id: string | null;
      work_order_id: string | null;
      ended_by_work_order_id: string | null;
    }[]
  >(`select kind, reason, started_at, ended_at, ended_by_id, work_order_id, ended_by_work_order_id from machine_downtime where machine_id = ? order by started_at`, [machineId]);

describe('machine state', () => {
  it('reads in service for a machine with no history, and 404 for another shop or an unknown code', async () => {
    const res = await get(shop.s.operator, '/machines/C1/status').expect(200);
    expect(res.body).toEqual({ state: 'in-service', since: null, reason: null });
    await get(other.s.operator, '/machines/NOPE/status').expect(404);
    await get(shop.s.operator, '/machines/has%20space/status').expect(400);
  });

  it('a fault that stops the machine: repair raised, out of service at once, one mail per responsible person, back in service when the repair is signed off', async () => {
    setClock('2027-02-10T08:15:00Z');
    const res = await post(shop.s.operator, '/machines/c1/faults', { description: 'Hydraulic hose weeping at the punch head', takeOutOfService: true }).expect(
      201,
    );
    expect(res.body.workOrderNumber).toBeGreaterThan(1000);
    // The test clock keeps ticking from the moment set, so times are compared to the minute.
    expect(res.body.status).toMatchObject({ state: 'out-of-service', reason: 'Fault: Hydraulic hose weeping at the punch head' });
    expect(res.body.status.since).toMatch(/^2027-02-10T08:15/);
    const status = await get(shop.s.technician, '/machines/C1/status').expect(200);
    expect(status.body.state).toBe('out-of-service');

    // Technician and admin hear once each; the operator who reported it does not; no second "new work" mail.
    const mails = await pendingMails(orm, shop.orgId);
    expect(mails.map((m) => [m.toAddress, m.kind]).sort()).toEqual([
      [shop.users.admin.email, 'machine-out-of-service'],
      [shop.users.technician.email, 'machine-out-of-service'],
    ]);
    expect(mails[0].textBody).toContain(`WO ${res.body.workOrderNumber}`);
    expect(mails[0].textBody).toContain(WORK_CAUTION);

    const wo = await get(shop.s.technician, `/work-orders/${res.body.workOrderId}`).expect(200);
    expect(wo.body.kind).toBe('corrective');
    expect(wo.body.instructions).toBe('Hydraulic hose weeping at the punch head');

    setClock('2027-02-10T11:45:00Z');
    await post(shop.s.technician, `/work-orders/${res.body.workOrderId}/close`, { labourMinutes: 150, notes: 'Hose replaced' }).expect(200);
    const back = (await get(shop.s.operator, '/machines/C1/status').expect(200)).body;
    expect(back).toMatchObject({ state: 'in-service', reason: null });
    expect(back.since).toMatch(/^2027-02-10T11:45/);
    const [d] = await downtimes(shop.machineId);
    expect(d.kind).toBe('failure');
    expect(new Date(d.started_at).toISOString()).toMatch(/^2027-02-10T08:15/);
    expect(new Date(d.ended_at!).toISOString()).toMatch(/^2027-02-10T11:45/);
    expect(d.ended_by_id).toBe(shop.users.technician.userId);
    expect(d.ended_by_work_order_id).toBe(res.body.workOrderId);

    // Signing the repair off a second time is refused and changes nothing.
    const again = await post(shop.s.technician, `/work-orders/${res.body.workOrderId}/close`, {}).expect(409);
    expect(again.body.error).toBe('conflict');
    expect(await downtimes(shop.machineId)).toHaveLength(1);
  });

  it('a fault that does not stop the machine raises the repair and mails the technicians, state unchanged', async () => {
    const res = await post(shop.s.operator, '/machines/PT1/faults', { description: 'Water level sensor reads low', takeOutOfService: false }).expect(201);
    expect(res.body.status.state).toBe('in-service');
    const mails = (await pendingMails(orm, shop.orgId)).filter((m) => m.kind === 'work-raised' && m.subject.includes(`WO ${res.body.workOrderNumber}`));
    expect(mails.map((m) => m.toAddress)).toEqual([shop.users.technician.email]);
    expect(await downtimes(shop.otherMachineId)).toHaveLength(0);
  });

  it('taking a machine out twice keeps one open interval and sends one set of mails', async () => {
    const before = (await pendingMails(orm, shop.orgId)).length;
    await post(shop.s.technician, '/machines/PT1/out-of-service', { reason: 'Gantry rail realignment', kind: 'planned' }).expect(201);
    const second = await post(shop.s.safety, '/machines/PT1/out-of-service', { reason: 'Another reason', kind: 'failure' }).expect(201);
    expect(second.body.reason).toBe('Gantry rail realignment');
    expect(await downtimes(shop.otherMachineId)).toHaveLength(1);
    // Admin and safety officer were told (not the technician who did it), once.
    expect((await pendingMails(orm, shop.orgId)).length - before).toBe(1);
    const back = await post(shop.s.technician, '/machines/PT1/return-to-service', { note: 'Rail aligned' }).expect(200);
    expect(back.body.state).toBe('in-service');
    const again = await post(shop.s.technician, '/machines/PT1/return-to-service', {}).expect(409);
    expect(again.body.message).toBe('Machine PT1 is not out of service');
  });

  it('refuses bad input naming the field, and writes nothing', async () => {
    const none = await post(shop.s.operator, '/machines/C1/faults', {}).expect(400);
    expect(none.body.fields.map((f: { path: string }) => f.path).sort()).toEqual(['description', 'takeOutOfService']);
    const short = await post(shop.s.operator, '/machines/C1/faults', { description: 'x', takeOutOfService: 'yes' }).expect(400);
    expect(short.body.fields.map((f: { path: string }) => f.path).sort()).toEqual(['description', 'takeOutOfService']);
    const code = await post(shop.s.operator, '/machines/C1/faults', {
      description: 'Torch will not fire',
      takeOutOfService: true,
      failureCode: 'WHATEVER',
    }).expect(400);
    expect(code.body.fields).toEqual([{ path: 'failureCode', message: "WHATEVER is not one of the shop's failure mode (what was seen) codes" }]);
    const kind = await post(shop.s.technician, '/machines/C1/out-of-service', { reason: 'Because', kind: 'maybe' }).expect(400);
    expect(kind.body.fields[0].path).toBe('kind');
    // Operators stop a machine by reporting a fault, not by the technicians' switch.
    await post(shop.s.operator, '/machines/C1/out-of-service', { reason: 'Because', kind: 'failure' }).expect(403);
    expect((await get(shop.s.operator, '/machines/C1/status').expect(200)).body.state).toBe('in-service');
    const count = await orm.em
      .fork()
      .execute<{ n: string }[]>(`select count(*) as n from work_order where organization_id = ? and title like '%Torch will not fire%'`, [shop.orgId]);
    expect(Number(count[0].n)).toBe(0);
  });

  it("answers 404 for a fault on another shop's machine, and writes nothing there", async () => {
    await post(other.s.operator, '/machines/C1/faults', { description: 'Someone else s machine', takeOutOfService: true }).expect(201); // its own C1
    const otherOnly = await post(other.s.operator, `/machines/NOT-HERE/faults`, { description: 'Nowhere', takeOutOfService: true }).expect(404);
    expect(otherOnly.body.error).toBe('not_found');
    // A code that exists only in the first shop.
    const em = orm.em.fork();
    await em.execute(`update machine set code = 'ONLY-A' where id = ?`, [shop.otherMachineId]);
    await post(other.s.operator, '/machines/ONLY-A/faults', { description: 'Not mine', takeOutOfService: true }).expect(404);
    await get(other.s.operator, '/machines/ONLY-A/status').expect(404);
    await em.execute(`update machine set code = 'PT1' where id = ?`, [shop.otherMachineId]);
    expect((await get(shop.s.operator, '/machines/PT1/status').expect(200)).body.state).toBe('in-service');
  });

  it('refuses a state change on a deactivated machine with 409 naming it', async () => {
    const created = await post(shop.s.technician, '/machines', { code: 'OLD1', name: 'Retired shear', kind: 'other' }).expect(201);
    await patch(shop.s.technician, `/machines/${created.body.id}`, { active: false }).expect(200);
    const res = await post(shop.s.technician, '/machines/OLD1/out-of-service', { reason: 'Broken', kind: 'failure' }).expect(409);
    expect(res.body.message).toMatch(/^Machine OLD1 is deactivated/);
    const fault = await post(shop.s.operator, '/machines/OLD1/faults', { description: 'Blade chipped', takeOutOfService: true }).expect(409);
    expect(fault.body.fields[0]).toEqual({ path: 'code', message: 'OLD1 is deactivated' });
    expect(await downtimes(created.body.id)).toHaveLength(0);
  });

  it('shows locked out while a lockout is applied, whatever else is recorded', async () => {
    const procId = await approvedProcedure(shop);
    const lock = await post(shop.s.technician, '/safety/lockouts', {
      procedureId: procId,
      reason: 'Replace the clamp',
      points: lockPoints('S'),
      password: PASSWORD,
    });
    expect(lock.status, JSON.stringify(lock.body)).toBe(201);
    const res = await get(shop.s.operator, '/machines/C1/status').expect(200);
    expect(res.body).toMatchObject({ state: 'locked-out', reason: 'Replace the clamp' });
  });
});
