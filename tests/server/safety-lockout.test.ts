import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { makeTestApp } from '../setup/test-app';
import { approvedProcedure, cellProcedure, countSignOffs, get, lockPoints, makeSafetyShop, PASSWORD, post, shopToday, type SafetyShop } from './safety-helpers';
import { WorkOrder } from '../../server/modules/work-orders/work-order.entity';
import { createMember } from '../../seed/factories';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let shop: SafetyShop;
let other: SafetyShop;
let procId: string;

beforeAll(async () => {
  t = await makeTestApp();
  shop = await makeSafetyShop(t.app, t.em(), 'loto');
  other = await makeSafetyShop(t.app, t.em(), 'loto-other');
  procId = await approvedProcedure(shop);
});
afterAll(() => t.close());

const apply = (who = shop.s.technician, overrides: Record<string, unknown> = {}) =>
  post(who, '/safety/lockouts', {
    procedureId: procId,
    reason: 'Replace the punch head clamp',
    points: lockPoints(`L${Math.random().toString(36).slice(2, 6)}`),
    password: PASSWORD,
    ...overrides,
  });

describe('lockout sessions', () => {
  it('refuses bad input with clear errors and writes nothing', async () => {
    const before = await countSignOffs(shop.orgId);
    // A role that may not lock out (operators are affected, not authorized, employees).
    await apply(shop.s.operator).expect(403);
    // Wrong password.
    const wrong = await apply(shop.s.technician, { password: 'guess' }).expect(401);
    expect(wrong.body.message).toMatch(/nothing was signed/);
    // Every energy source of the procedure must be locked out.
    const missing = await apply(shop.s.technician, { points: lockPoints('M').slice(0, 2) }).expect(400);
    expect(missing.body.message).toBe('Lock out every energy source the procedure names; missing: PL1 (Plasma power source)');
    // Unknown point, duplicate lock.
    const unknown = await apply(shop.s.technician, { points: [...lockPoints('U'), { sourceKey: 'Z9', device: 'lock', lockNumber: 'U-99' }] }).expect(400);
    expect(unknown.body.fields[0].path).toBe('points.3.sourceKey');
    const dup = await apply(shop.s.technician, { points: lockPoints('D').map((p) => ({ ...p, lockNumber: 'D-1' })) }).expect(400);
    expect(dup.body.fields.map((f: { path: string }) => f.path)).toEqual(['points.1.lockNumber', 'points.2.lockNumber']);
    // Another shop's procedure is not found.
    await post(other.s.technician, '/safety/lockouts', { procedureId: procId, reason: 'x x x', points: lockPoints('O'), password: PASSWORD }).expect(404);
    expect(await countSignOffs(shop.orgId)).toBe(before);
    expect((await get(shop.s.safety, '/safety/lockouts?state=open').expect(200)).body.total).toBe(0);
  });

  it('applies, verifies and releases; only the person who applied the locks removes them', async () => {
    const applied = await apply().expect(201);
    const id = applied.body.id;
    let d = await get(shop.s.operator, `/safety/lockouts/${id}`).expect(200);
    expect(d.body).toMatchObject({ state: 'locked', primaryName: `technician of ${shop.slug}`, machineCode: 'C1', procedureVersion: 1 });
    expect(d.body.points.map((p: { sourceKey: string }) => p.sourceKey)).toEqual(['E1', 'H1', 'PL1']);

    // A lock cannot hang in two places.
    const lock = d.body.points[0].lockNumber;
    const clash = await apply(shop.s.safety, { points: lockPoints('Z').map((p, i) => (i === 0 ? { ...p, lockNumber: lock } : p)) }).expect(409);
    expect(clash.body.message).toBe(`Lock ${lock} is already on C1 (E1)`);

    // Verification: every point ticked, by the holder.
    const pointIds = d.body.points.map((p: { id: string }) => p.id);
    await post(shop.s.safety, `/safety/lockouts/${id}/verify`, { testedPointIds: pointIds, startAttempted: true, password: PASSWORD }).expect(403);
    const partial = await post(shop.s.technician, `/safety/lockouts/${id}/verify`, {
      testedPointIds: pointIds.slice(0, 2),
      startAttempted: true,
      password: PASSWORD,
    }).expect(400);
    expect(partial.body.message).toBe('Test every isolation point before signing; not ticked: PL1');
    const noStart = await post(shop.s.technician, `/safety/lockouts/${id}/verify`, {
      testedPointIds: pointIds,
      startAttempted: false,
      password: PASSWORD,
    }).expect(400);
    expect(noStart.body.fields[0].path).toBe('startAttempted');
    await post(shop.s.technician, `/safety/lockouts/${id}/verify`, { testedPointIds: pointIds, startAttempted: true, password: PASSWORD }).expect(201);

    // Someone else tries to release: refused, naming whose locks they are (1910.147(e)(3)).
    const notMine = await post(shop.s.safety, `/safety/lockouts/${id}/release`, {
      areaChecked: true,
      peopleClear: true,
      affectedNotified: true,
      password: PASSWORD,
    }).expect(403);
    expect(notMine.body.message).toMatch(
      /^Only the person who applied a lock removes it \(OSHA 29 CFR 1910\.147\(e\)\(3\)\): E1 lock .* belongs to technician of/,
    );
    // The release checklist is not optional.
    const unchecked = await post(shop.s.technician, `/safety/lockouts/${id}/release`, {
      areaChecked: true,
      peopleClear: false,
      affectedNotified: true,
      password: PASSWORD,
    }).expect(400);
    expect(unchecked.body.fields).toEqual([{ path: 'peopleClear', message: 'Make sure everyone is clear of the machine' }]);
    await post(shop.s.technician, `/safety/lockouts/${id}/release`, {
      areaChecked: true,
      peopleClear: true,
      affectedNotified: true,
      password: PASSWORD,
    }).expect(201);

    d = await get(shop.s.operator, `/safety/lockouts/${id}`).expect(200);
    expect(d.body.state).toBe('released');
    expect(d.body.points.every((p: { removedByName: string }) => p.removedByName === `technician of ${shop.slug}`)).toBe(true);
    expect(d.body.signOffs.map((s: { meaning: string }) => s.meaning)).toEqual(['lockout-applied', 'isolation-verified', 'lockout-released']);
    await post(shop.s.technician, `/safety/lockouts/${id}/release`, {
      areaChecked: true,
      peopleClear: true,
      affectedNotified: true,
      password: PASSWORD,
    }).expect(409);
    await get(other.s.operator, `/safety/lockouts/${id}`).expect(404);
  });

  it('runs a group lockout: members sign on and off with personal locks; release waits for them', async () => {
    const applied = await apply(shop.s.technician, { group: true }).expect(201);
    const id = applied.body.id;
    const second = await createMember(t.em(), { id: shop.orgId }, { email: `second-tech@${shop.slug}.example`, name: 'Second Technician', role: 'technician' });
    const { signIn } = await import('../setup/test-app');
    const tech2 = await signIn(t.app, `second-tech@${shop.slug}.example`);
    // OSHA 29 CFR 1910.147(c)(7)(i)(A): a technician's role is not enough; without training on this procedure the join is refused and nothing is signed.
    const before = await countSignOffs(shop.orgId);
    const untrained = await post(tech2, `/safety/lockouts/${id}/join`, { lockNumber: 'P-200', password: PASSWORD }).expect(403);
    expect(untrained.body.message).toMatch(/^Second Technician has no authorized-employee training on C1 .*1910\.147\(c\)\(7\)\(i\)\(A\)/);
    expect(await countSignOffs(shop.orgId)).toBe(before);
    await post(shop.s.safety, '/safety/training', {
      userId: second.user.id,
      procedureId: procId,
      kind: 'authorized',
      trainedOn: shopToday(),
      password: PASSWORD,
    }).expect(201);
    await post(tech2, `/safety/lockouts/${id}/join`, { lockNumber: 'P-200', password: PASSWORD }).expect(201);
    await post(tech2, `/safety/lockouts/${id}/join`, { lockNumber: 'P-201', password: PASSWORD }).expect(409);
    await post(shop.s.safety, `/safety/lockouts/${id}/join`, { lockNumber: 'P-200', password: PASSWORD }).expect(409); // that lock is on already
    await post(shop.s.safety, `/safety/lockouts/${id}/join`, { lockNumber: 'P-300', password: PASSWORD }).expect(201);

    const blocked = await post(shop.s.technician, `/safety/lockouts/${id}/release`, {
      areaChecked: true,
      peopleClear: true,
      affectedNotified: true,
      password: PASSWORD,
    }).expect(409);
    expect(blocked.body.message).toBe(
      `Personal locks are still on this group lockout: Second Technician (P-200), safety of ${shop.slug} (P-300). Each person removes their own lock first.`,
    );
    // Nobody takes another person's personal lock off.
    await post(shop.s.technician, `/safety/lockouts/${id}/leave`, { password: PASSWORD }).expect(409);
    await post(tech2, `/safety/lockouts/${id}/leave`, { password: PASSWORD }).expect(201);
    await post(shop.s.safety, `/safety/lockouts/${id}/leave`, { password: PASSWORD }).expect(201);
    await post(shop.s.technician, `/safety/lockouts/${id}/release`, {
      areaChecked: true,
      peopleClear: true,
      affectedNotified: true,
      password: PASSWORD,
    }).expect(201);
    const d = await get(shop.s.safety, `/safety/lockouts/${id}`).expect(200);
    expect(d.body.members.map((m: { name: string; leftAt: string | null }) => [m.name, m.leftAt !== null])).toEqual([
      ['Second Technician', true],
      [`safety of ${shop.slug}`, true],
    ]);
    expect(d.body.signOffs.map((s: { meaning: string }) => s.meaning)).toEqual([
      'lockout-applied',
      'member-joined',
      'member-joined',
      'member-left',
      'member-left',
      'lockout-released',
    ]);
    expect(second.user.id).toBeTruthy();
  });

  it('hands over at shift change explicitly: the oncoming person’s locks go on before the off-going ones come off', async () => {
    const applied = await apply().expect(201);
    const id = applied.body.id;
    // Only an authorized employee can take over.
    const toOperator = await post(shop.s.technician, `/safety/lockouts/${id}/handover`, { toUserId: shop.users.operator.userId, password: PASSWORD }).expect(
      400,
    );
    expect(toOperator.body.fields[0].path).toBe('toUserId');
    await post(shop.s.safety, `/safety/lockouts/${id}/handover`, { toUserId: shop.users.safety.userId, password: PASSWORD }).expect(403);
    await post(shop.s.technician, `/safety/lockouts/${id}/handover`, {
      toUserId: shop.users.safety.userId,
      note: 'Night shift carries on',
      password: PASSWORD,
    }).expect(201);
    let d = await get(shop.s.safety, `/safety/lockouts/${id}`).expect(200);
    expect(d.body.pendingHandoverToName).toBe(`safety of ${shop.slug}`);
    const pts = d.body.points as { id: string; sourceKey: string }[];
    // Not everyone can accept, and every point needs the oncoming person's lock.
    await post(shop.s.technician, `/safety/lockouts/${id}/accept-handover`, {
      locks: pts.map((p, i) => ({ pointId: p.id, lockNumber: `N-${i}` })),
      password: PASSWORD,
    }).expect(403);
    const short = await post(shop.s.safety, `/safety/lockouts/${id}/accept-handover`, {
      locks: pts.slice(1).map((p, i) => ({ pointId: p.id, lockNumber: `N-${i}` })),
      password: PASSWORD,
    }).expect(400);
    expect(short.body.message).toBe('Put your own lock on every point before taking over; missing: E1');
    await post(shop.s.safety, `/safety/lockouts/${id}/accept-handover`, {
      locks: pts.map((p, i) => ({ pointId: p.id, lockNumber: `N-${i}` })),
      password: PASSWORD,
    }).expect(201);
    d = await get(shop.s.safety, `/safety/lockouts/${id}`).expect(200);
    expect(d.body.primaryName).toBe(`safety of ${shop.slug}`);
    const active = d.body.points.filter((p: { removedAt: string | null }) => p.removedAt === null);
    expect(active.map((p: { lockNumber: string; holderName: string }) => [p.lockNumber, p.holderName])).toEqual([
      ['N-0', `safety of ${shop.slug}`],
      ['N-1', `safety of ${shop.slug}`],
      ['N-2', `safety of ${shop.slug}`],
    ]);
    // The off-going technician can no longer release; the new holder can.
    await post(shop.s.technician, `/safety/lockouts/${id}/release`, {
      areaChecked: true,
      peopleClear: true,
      affectedNotified: true,
      password: PASSWORD,
    }).expect(403);
    await post(shop.s.safety, `/safety/lockouts/${id}/release`, { areaChecked: true, peopleClear: true, affectedNotified: true, password: PASSWORD }).expect(
      201,
    );
    const sigs = await get(shop.s.safety, `/safety/sign-offs?sort=seq&dir=asc&meaning=handover-accepted`).expect(200);
    expect(sigs.body.rows.at(-1).summary).toMatch(/taken over from technician of .*; E1 .* → N-0, H1 .* → N-1, PL1 .* → N-2/);
  });

  it('marks the linked work order applied and released, inside the same transaction', async () => {
    const em = t.em();
    const wo = em.create(WorkOrder, {
      organization: shop.orgId,
      number: 5001,
      machine: shop.machineId,
      kind: 'corrective',
      title: 'Replace clamp',
      instructions: '',
      status: 'open',
      requiresLockout: true,
      checklist: [],
      plannedParts: [],
      labourMinutes: 0,
      notes: '',
    });
    const foreign = em.create(WorkOrder, {
      organization: other.orgId,
      number: 5002,
      machine: other.machineId,
      kind: 'corrective',
      title: 'Theirs',
      instructions: '',
      status: 'open',
      requiresLockout: true,
      checklist: [],
      plannedParts: [],
      labourMinutes: 0,
      notes: '',
    });
    const elsewhere = em.create(WorkOrder, {
      organization: shop.orgId,
      number: 5003,
      machine: shop.otherMachineId,
      kind: 'corrective',
      title: 'Table',
      instructions: '',
      status: 'open',
      requiresLockout: true,
      checklist: [],
      plannedParts: [],
      labourMinutes: 0,
      notes: '',
    });
    await em.flush();
    const before = await countSignOffs(shop.orgId);
    await apply(shop.s.technician, { workOrderId: foreign.id }).expect(404);
    const wrongMachine = await apply(shop.s.technician, { workOrderId: elsewhere.id }).expect(400);
    expect(wrongMachine.body.fields[0]).toEqual({ path: 'workOrderId', message: 'Work order 5003 is for another machine' });
    expect(await countSignOffs(shop.orgId)).toBe(before);

    const applied = await apply(shop.s.technician, { workOrderId: wo.id }).expect(201);
    let row = await t.em().findOneOrFail(WorkOrder, wo.id, { filters: false });
    expect(row.lockoutSessionId).toBe(applied.body.id);
    expect(row.lockoutReleasedAt).toBeNull();
    await post(shop.s.technician, `/safety/lockouts/${applied.body.id}/release`, {
      areaChecked: true,
      peopleClear: true,
      affectedNotified: true,
      password: PASSWORD,
    }).expect(201);
    row = await t.em().findOneOrFail(WorkOrder, wo.id, { filters: false });
    expect(row.lockoutReleasedAt).toBeInstanceOf(Date);
  });

  it('refuses a lockout with a procedure that has no approved version', async () => {
    const draft = await post(shop.s.safety, '/safety/procedures', { ...cellProcedure('Draft only'), machineId: shop.otherMachineId }).expect(201);
    const res = await apply(shop.s.technician, { procedureId: draft.body.id }).expect(409);
    expect(res.body.fields).toEqual([{ path: 'procedureId', message: 'No approved version' }]);
  });
});
