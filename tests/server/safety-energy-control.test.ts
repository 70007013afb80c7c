// Energy-control programme checks against OSHA 29 CFR 1910.147: authorization from training, the
// absent-employee lock removal, zero-energy readings, own-draft approval, the lock register and the
// alarm for a counter that rises during a verified lockout. Each check names its paragraph.
import { describe, it, expect, beforeAll, afterAll, afterEach } from 'vitest';
import { makeTestApp } from '../setup/test-app';
import {
  approvedProcedure,
  cellProcedure,
  countSignOffs,
  get,
  lockPoints,
  makeSafetyShop,
  PASSWORD,
  post,
  put,
  shopToday,
  trainAuthorized,
  type SafetyShop,
} from './safety-helpers';
import { setClock } from '../../shared/clock';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let shop: SafetyShop;
let procId: string;

beforeAll(async () => {
  t = await makeTestApp();
  shop = await makeSafetyShop(t.app, t.em(), 'ecp');
  procId = await approvedProcedure(shop, cellProcedure(), shop.machineId, ['technician']);
});
afterAll(() => t.close());
afterEach(() => setClock(null));

const apply = (who = shop.s.technician, prefix = `L${Math.random().toString(36).slice(2, 6)}`) =>
  post(who, '/safety/lockouts', { procedureId: procId, reason: 'Replace the clamp', points: lockPoints(prefix), password: PASSWORD });

async function events(kind: 'refused' | 'alarm') {
  return (await get(shop.s.safety, `/safety/events?kind=${kind}&pageSize=100`).expect(200)).body.rows as {
    action: string;
    reason: string;
    personName: string | null;
  }[];
}

async function verify(id: string) {
  const d = (await get(shop.s.technician, `/safety/lockouts/${id}`).expect(200)).body;
  const ids = d.points.map((p: { id: string }) => p.id);
  await post(shop.s.technician, `/safety/lockouts/${id}/verify`, { testedPointIds: ids, startAttempted: true, password: PASSWORD }).expect(201);
  return d;
}

describe('energy-control programme', () => {
  it('decides who may lock out from a current authorized training record, not from the role', async () => {
    // 1910.147(c)(7)(i)(A): the safety officer's role could lock out, but without training on this procedure it may not.
    const before = await countSignOffs(shop.orgId);
    const refused = await apply(shop.s.safety).expect(403);
    expect(refused.body.message).toMatch(
      /has no authorized-employee training on C1 .*a role alone does not allow applying locks \(OSHA 29 CFR 1910\.147\(c\)\(7\)\(i\)\(A\)\)/,
    );
    expect(await countSignOffs(shop.orgId)).toBe(before);
    const auth = (await get(shop.s.safety, `/safety/procedures/${procId}/authorization`).expect(200)).body;
    expect(auth).toMatchObject({ authorized: false, currentVersion: 1, trainedVersion: null });
    // The refusal is in the safety audit with who and why.
    expect((await events('refused')).find((e) => e.action === 'lockout.apply')).toMatchObject({ personName: `safety of ${shop.slug}` });
    // The trained technician may.
    expect((await get(shop.s.technician, `/safety/procedures/${procId}/authorization`).expect(200)).body).toMatchObject({
      authorized: true,
      trainedVersion: 1,
    });
  });

  it('sends people back to training after a changed version (c)(7)(iii)(A) and after deviations at an inspection (c)(6)(i)(B)', async () => {
    const proc = await approvedProcedure(shop, cellProcedure('Retrain procedure'), shop.otherMachineId, ['technician']);
    const v2 = cellProcedure('Retrain procedure');
    v2.release.push('Check the guard interlock.');
    await put(shop.s.technician, `/safety/procedures/${proc}/draft`, v2).expect(200);
    // 1910.147(c)(7)(iii)(A): a change that needs retraining.
    await post(shop.s.safety, `/safety/procedures/${proc}/versions/2/approve`, { password: PASSWORD, retrainingRequired: true }).expect(201);
    let auth = (await get(shop.s.technician, `/safety/procedures/${proc}/authorization`).expect(200)).body;
    expect(auth.authorized).toBe(false);
    expect(auth.reason).toMatch(/was trained on version 1 .*version 2 changed it and needs retraining first \(OSHA 29 CFR 1910\.147\(c\)\(7\)\(iii\)\(A\)\)/);
    await trainAuthorized(shop, 'technician', proc);
    expect((await get(shop.s.technician, `/safety/procedures/${proc}/authorization`).expect(200)).body.authorized).toBe(true);

    // 1910.147(c)(6)(i)(B): deviations recorded against the technician at the periodic inspection.
    await post(shop.s.safety, '/safety/inspections', {
      procedureId: proc,
      inspectedOn: shopToday(),
      employeeIds: [shop.users.technician.userId],
      findings: 'Observed a lockout of the table.',
      deviations: 'Did not try the start button before work.',
      deviationEmployeeIds: [shop.users.technician.userId],
      responsibilitiesReviewed: true,
      password: PASSWORD,
    }).expect(201);
    auth = (await get(shop.s.technician, `/safety/procedures/${proc}/authorization`).expect(200)).body;
    expect(auth.reason).toMatch(/recorded deviations by technician of .*1910\.147\(c\)\(6\)\(i\)\(B\), \(c\)\(7\)\(iii\)\(B\)/);
    const tasks = (await get(shop.s.safety, '/safety/tasks').expect(200)).body as { kind: string; title: string; personId: string | null }[];
    expect(
      tasks.find((x) => x.kind === 'retraining' && x.personId === shop.users.technician.userId && /deviations at the inspection/.test(x.title)),
    ).toBeTruthy();
    await trainAuthorized(shop, 'technician', proc);
    expect((await get(shop.s.technician, `/safety/procedures/${proc}/authorization`).expect(200)).body.authorized).toBe(true);
  });

  it('authorizes an operator for a named minor-servicing task only (1910.147(a)(2)(ii) note)', async () => {
    const content = {
      ...cellProcedure('Minor servicing procedure'),
      minorTasks: [
        { key: 'torch-consumables', name: 'Torch consumable change', alternativeMeasures: ['Plasma source off at the panel and its key in your pocket'] },
      ],
    };
    const created = await post(shop.s.technician, '/safety/procedures', { ...content, machineId: shop.otherMachineId }).expect(201);
    await post(shop.s.safety, `/safety/procedures/${created.body.id}/versions/1/approve`, { password: PASSWORD }).expect(201);
    const bad = await post(shop.s.safety, '/safety/training', {
      userId: shop.users.operator.userId,
      procedureId: created.body.id,
      kind: 'minor-servicing',
      minorTask: 'slat-change',
      trainedOn: shopToday(),
      password: PASSWORD,
    }).expect(400);
    expect(bad.body.fields[0]).toEqual({ path: 'minorTask', message: "Choose one of the procedure's minor-servicing tasks: torch-consumables" });
    await trainAuthorized(shop, 'operator', created.body.id, 'minor-servicing', 'torch-consumables');
    const auth = (await get(shop.s.operator, `/safety/procedures/${created.body.id}/authorization`).expect(200)).body;
    expect(auth).toMatchObject({ authorized: false, minorTasks: ['torch-consumables'] });
  });

  it('refuses approving one’s own draft, writes nothing, and shows the attempt in the audit', async () => {
    const created = await post(shop.s.safety, '/safety/procedures', { ...cellProcedure('Own draft'), machineId: shop.otherMachineId }).expect(201);
    const before = await countSignOffs(shop.orgId);
    const res = await post(shop.s.safety, `/safety/procedures/${created.body.id}/versions/1/approve`, { password: PASSWORD }).expect(403);
    expect(res.body.message).toMatch(/^You wrote version 1 of this procedure, so someone else must review and approve it/);
    expect(await countSignOffs(shop.orgId)).toBe(before);
    expect((await events('refused')).some((e) => e.action === 'procedure.approve' && /You wrote version 1/.test(e.reason))).toBe(true);
  });

  it('refuses a zero-energy reading without a unit and records one with its instrument and proving', async () => {
    const id = (await apply().expect(201)).body.id;
    const d = (await get(shop.s.technician, `/safety/lockouts/${id}`).expect(200)).body;
    const ids = d.points.map((p: { id: string }) => p.id);
    const before = await countSignOffs(shop.orgId);
    const reading = { pointId: ids[0], value: 0, unit: 'V', instrument: 'Two-pole tester VT-3', testerProvedBefore: true, testerProvedAfter: true };
    const noUnit = await post(shop.s.technician, `/safety/lockouts/${id}/verify`, {
      testedPointIds: ids,
      readings: [{ ...reading, unit: '' }],
      startAttempted: true,
      password: PASSWORD,
    }).expect(400);
    expect(noUnit.body.fields[0].path).toBe('readings.0.unit');
    // Live-dead-live proving of the tester (common practice in NFPA 70E work).
    const unproved = await post(shop.s.technician, `/safety/lockouts/${id}/verify`, {
      testedPointIds: ids,
      readings: [{ ...reading, testerProvedAfter: false }],
      startAttempted: true,
      password: PASSWORD,
    }).expect(400);
    expect(unproved.body.fields[0].path).toBe('readings.0.testerProvedAfter');
    expect(await countSignOffs(shop.orgId)).toBe(before);
    expect((await events('refused')).filter((e) => e.action === 'lockout.verify').length).toBeGreaterThanOrEqual(2);
    await post(shop.s.technician, `/safety/lockouts/${id}/verify`, {
      testedPointIds: ids,
      readings: [reading],
      startAttempted: true,
      password: PASSWORD,
    }).expect(201);
    const sig = (await get(shop.s.technician, `/safety/lockouts/${id}`).expect(200)).body.signOffs.at(-1);
    expect(sig.meaning).toBe('isolation-verified');
    await post(shop.s.technician, `/safety/lockouts/${id}/release`, {
      areaChecked: true,
      peopleClear: true,
      affectedNotified: true,
      password: PASSWORD,
    }).expect(201);
  });

  it('removes an absent employee’s locks only through the signed (e)(3) steps', async () => {
    const prefix = `AB${Math.random().toString(36).slice(2, 5)}`;
    const id = (await apply(shop.s.technician, prefix).expect(201)).body.id;
    // 1910.147(e)(3): someone else's lock does not come off by release.
    const release = await post(shop.s.safety, `/safety/lockouts/${id}/release`, {
      areaChecked: true,
      peopleClear: true,
      affectedNotified: true,
      password: PASSWORD,
    }).expect(403);
    expect(release.body.message).toMatch(/absent-employee removal steps/);
    const started = await post(shop.s.admin, `/safety/lockouts/${id}/absent-removals`, {
      absentUserId: shop.users.technician.userId,
      notOnSite: true,
      note: 'Badge log shows checked out at 14:02; not in the shop on a walk-round',
      password: PASSWORD,
    }).expect(201);
    const rid = started.body.id;
    const step = (who: typeof shop.s.admin, s: string, note = 'Done as described in full') =>
      post(who, `/safety/absent-removals/${rid}/steps`, { step: s, note, password: PASSWORD });
    // Out of order: refused, naming the next step.
    expect((await step(shop.s.admin, 'locks-removed').expect(400)).body.message).toMatch(
      /next is “Attempt to contact the employee” \(1910\.147\(e\)\(3\)\(ii\)\)/,
    );
    await step(shop.s.admin, 'contact-attempted', 'Called twice and left a voicemail at 14:30').expect(201);
    // (e)(3): the safety officer authorizes, not the supervisor.
    await step(shop.s.admin, 'removal-authorized').expect(403);
    await step(shop.s.safety, 'removal-authorized', 'Authorized after reviewing the contact attempts').expect(201);
    await step(shop.s.admin, 'locks-removed', 'Area checked, all clear, locks cut').expect(201);
    const d = (await get(shop.s.safety, `/safety/lockouts/${id}`).expect(200)).body;
    expect(d.state).toBe('released');
    expect(d.points.every((p: { removedAt: string | null; removedByName: string }) => p.removedAt && p.removedByName === `admin of ${shop.slug}`)).toBe(true);
    // (e)(3)(iii): the employee is told before resuming: until then they cannot lock out again.
    expect((await apply().expect(403)).body.message).toMatch(/removed while you were away.*1910\.147\(e\)\(3\)\(iii\)/);
    await step(shop.s.admin, 'employee-informed', 'Told at the start of the next shift').expect(201);
    const removals = (await get(shop.s.safety, `/safety/lockouts/${id}/absent-removals`).expect(200)).body;
    expect(removals[0].steps.map((s: { step: string; signerName: string }) => [s.step, s.signerName])).toEqual([
      ['absence-verified', `admin of ${shop.slug}`],
      ['contact-attempted', `admin of ${shop.slug}`],
      ['removal-authorized', `safety of ${shop.slug}`],
      ['locks-removed', `admin of ${shop.slug}`],
      ['employee-informed', `admin of ${shop.slug}`],
    ]);
    // The lock register shows where each lock has been.
    const reg = (await get(shop.s.operator, `/safety/locks?q=${prefix}-01`).expect(200)).body;
    expect(reg.rows[0]).toMatchObject({ lockNumber: `${prefix}-01`.toUpperCase(), current: null, holderName: `technician of ${shop.slug}` });
    expect(reg.rows[0].history[0]).toMatchObject({ machineCode: 'C1', where: 'E1', removedByName: `admin of ${shop.slug}` });
  });

  it('raises the alarm at once when a counter rises between two readings inside a verified lockout', async () => {
    setClock('2027-03-10T08:00:00Z');
    const meter = (
      await post(shop.s.admin, '/meters', {
        machineId: shop.machineId,
        code: `strokes-${Math.random().toString(36).slice(2, 6)}`,
        name: 'Ram strokes',
        kind: 'count',
        unit: 'hits',
      }).expect(201)
    ).body.id;
    await post(shop.s.operator, `/meters/${meter}/readings`, { value: 1000 }).expect(201);
    setClock('2027-03-10T08:05:00Z');
    const id = (await apply().expect(201)).body.id;
    await verify(id);
    setClock('2027-03-10T08:10:00Z');
    // 08:00 → 08:10 straddles the verification: not evidence (1910.147(d)(6)).
    await post(shop.s.operator, `/meters/${meter}/readings`, { value: 1010 }).expect(201);
    expect((await events('alarm')).length).toBe(0);
    setClock('2027-03-10T08:20:00Z');
    await post(shop.s.operator, `/meters/${meter}/readings`, { value: 1025 }).expect(201);
    const alarms = await events('alarm');
    expect(alarms).toHaveLength(1);
    expect(alarms[0].reason).toBe(
      'Machine ran while locked out — or an energy source is missing from the procedure: C1 Ram strokes rose by 15 hits (1,010 → 1,025) while locked out and verified',
    );
    const station = (await get(shop.s.operator, '/stations/C1').expect(200)).body;
    expect(station.alarms).toEqual([expect.objectContaining({ machineCode: 'C1', lockoutId: id })]);
    const mails = await t
      .em()
      .getConnection()
      .execute<{ to_address: string; subject: string }[]>(
        `select to_address, subject from outbox_mail where kind = 'lockout-alarm' and organization_id = ? order by to_address`,
        [shop.orgId],
      );
    expect(mails.map((m) => m.to_address)).toEqual([shop.users.safety.email, shop.users.technician.email]);
    expect(mails[0].subject).toBe('ALARM C1: counter rose while locked out');
    // The same evidence is not raised twice.
    setClock('2027-03-10T08:25:00Z');
    await post(shop.s.operator, `/meters/${meter}/readings`, { value: 1025 }).expect(201);
    expect(await events('alarm')).toHaveLength(1);
    await post(shop.s.technician, `/safety/lockouts/${id}/release`, {
      areaChecked: true,
      peopleClear: true,
      affectedNotified: true,
      password: PASSWORD,
    }).expect(201);
  });
});
