// Temporary removal of lockout devices to test or position the machine: OSHA 29 CFR 1910.147(f)(1)(i)-(v).
import { describe, it, expect, beforeAll, afterAll, afterEach } from 'vitest';
import { makeTestApp } from '../setup/test-app';
import { approvedProcedure, cellProcedure, countSignOffs, get, lockPoints, makeSafetyShop, PASSWORD, post, type SafetyShop } from './safety-helpers';
import { setClock } from '../../shared/clock';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let shop: SafetyShop;
let procId: string;

beforeAll(async () => {
  t = await makeTestApp();
  shop = await makeSafetyShop(t.app, t.em(), 'testwin');
  procId = await approvedProcedure(shop, cellProcedure(), shop.machineId, ['technician', 'safety']);
});
afterAll(() => t.close());
afterEach(() => setClock(null));

const uniq = () => Math.random().toString(36).slice(2, 6).toUpperCase();
type Point = { id: string; sourceKey: string; lockNumber: string; removedAt: string | null };

async function detail(id: string) {
  return (await get(shop.s.technician, `/safety/lockouts/${id}`).expect(200)).body as {
    state: string;
    points: Point[];
    signOffs: { meaning: string }[];
  };
}
const active = async (id: string) => (await detail(id)).points.filter((p) => !p.removedAt);

/** A verified lockout on the cell held by the technician. */
async function verifiedLockout(group = false) {
  const prefix = `W${uniq()}`;
  const id = (
    await post(shop.s.technician, '/safety/lockouts', {
      procedureId: procId,
      reason: 'Replace the clamp',
      group,
      points: lockPoints(prefix),
      password: PASSWORD,
    }).expect(201)
  ).body.id as string;
  const ids = (await active(id)).map((p) => p.id);
  await post(shop.s.technician, `/safety/lockouts/${id}/verify`, { testedPointIds: ids, startAttempted: true, password: PASSWORD }).expect(201);
  return { id, prefix };
}

const openBody = (removePointIds: string[], over: Record<string, unknown> = {}) => ({
  purpose: 'testing',
  reason: 'Jog the ram once to check the new clamp seats',
  machineCleared: true,
  employeesRemoved: true,
  removePointIds,
  password: PASSWORD,
  ...over,
});
const reverifyBody = (ids: string[]) => ({ testedPointIds: ids, startAttempted: true, password: PASSWORD });
const release = (id: string) =>
  post(shop.s.technician, `/safety/lockouts/${id}/release`, { areaChecked: true, peopleClear: true, affectedNotified: true, password: PASSWORD });

async function refusals() {
  return (await get(shop.s.safety, `/safety/events?kind=refused&pageSize=100`).expect(200)).body.rows as { action: string; reason: string }[];
}

describe('test or positioning window (OSHA 29 CFR 1910.147(f)(1))', () => {
  it('(f)(1)(i)-(v): opens the window, reapplies, re-verifies — each step signed into a chain that verifies', async () => {
    const { id } = await verifiedLockout();
    const points = await active(id);
    const e1 = points.find((p) => p.sourceKey === 'E1')!;
    const pl1 = points.find((p) => p.sourceKey === 'PL1')!;

    // (i)-(iii): cleared, people out, E1 and PL1 devices off; H1's valve cover stays on.
    await post(shop.s.technician, `/safety/lockouts/${id}/test-windows`, openBody([e1.id, pl1.id])).expect(201);
    let d = await detail(id);
    expect(d.state).toBe('testing');
    expect(d.points.filter((p) => !p.removedAt).map((p) => p.sourceKey)).toEqual(['H1']);
    const windows = (await get(shop.s.operator, `/safety/lockouts/${id}/test-windows`).expect(200)).body;
    expect(windows).toHaveLength(1);
    expect(windows[0]).toMatchObject({ purpose: 'testing', reappliedAt: null, reverifiedAt: null });
    expect(windows[0].removed.map((r: { sourceKey: string }) => r.sourceKey).sort()).toEqual(['E1', 'PL1']);

    // (v) first half: a device back on each point that came off — the same lock numbers may go back on.
    await post(shop.s.technician, `/safety/lockouts/${id}/test-windows/reapply`, {
      locks: [
        { pointId: e1.id, lockNumber: e1.lockNumber },
        { pointId: pl1.id, lockNumber: pl1.lockNumber },
      ],
      deEnergized: true,
      password: PASSWORD,
    }).expect(201);
    d = await detail(id);
    expect(d.state).toBe('reapplied');
    expect(
      d.points
        .filter((p) => !p.removedAt)
        .map((p) => p.sourceKey)
        .sort(),
    ).toEqual(['E1', 'H1', 'PL1']);

    // (v) second half: isolation verified again (1910.147(d)(6)) on every point now on.
    const now = (await active(id)).map((p) => p.id);
    await post(shop.s.technician, `/safety/lockouts/${id}/test-windows/reverify`, reverifyBody(now)).expect(201);
    d = await detail(id);
    expect(d.state).toBe('verified');
    expect(d.signOffs.map((s) => s.meaning)).toEqual([
      'lockout-applied',
      'isolation-verified',
      'testing-window-opened',
      'energy-control-reapplied',
      'isolation-reverified',
    ]);
    const chain = (await get(shop.s.safety, '/safety/chain/verify').expect(200)).body;
    expect(chain).toMatchObject({ ok: true, problem: null });
    await release(id).expect(201);
  });

  it('(f)(1)(iii): refuses a released or not-yet-verified lockout, another person, missing confirmations — nothing written, refusal recorded', async () => {
    const prefix = `N${uniq()}`;
    const unverified = (
      await post(shop.s.technician, '/safety/lockouts', { procedureId: procId, reason: 'Clamp', points: lockPoints(prefix), password: PASSWORD }).expect(201)
    ).body.id as string;
    const uPoints = (await active(unverified)).map((p) => p.id);
    const before = await countSignOffs(shop.orgId);

    const notVerified = await post(shop.s.technician, `/safety/lockouts/${unverified}/test-windows`, openBody(uPoints)).expect(409);
    expect(notVerified.body.fields).toEqual([{ path: 'state', message: expect.stringMatching(/not verified yet/) }]);

    await post(shop.s.technician, `/safety/lockouts/${unverified}/verify`, reverifyBody(uPoints)).expect(201);
    const afterVerify = await countSignOffs(shop.orgId);
    expect(afterVerify).toBe(before + 1);

    // Someone other than the holder (the safety officer is authorized, but does not hold it).
    const other = await post(shop.s.safety, `/safety/lockouts/${unverified}/test-windows`, openBody(uPoints)).expect(403);
    expect(other.body.message).toMatch(/^Only technician of .* who holds this lockout, can take devices off/);
    // (f)(1)(i) and (ii) confirmations.
    const notCleared = await post(shop.s.technician, `/safety/lockouts/${unverified}/test-windows`, openBody(uPoints, { machineCleared: false })).expect(400);
    expect(notCleared.body.fields).toEqual([{ path: 'machineCleared', message: 'Clear the machine of tools and materials first (1910.147(f)(1)(i))' }]);
    const peopleIn = await post(shop.s.technician, `/safety/lockouts/${unverified}/test-windows`, openBody(uPoints, { employeesRemoved: false })).expect(400);
    expect(peopleIn.body.fields[0].path).toBe('employeesRemoved');
    // A reason is needed, and a point that is not on this lockout is refused.
    const noReason = await post(shop.s.technician, `/safety/lockouts/${unverified}/test-windows`, openBody(uPoints, { reason: '' })).expect(400);
    expect(noReason.body.fields[0].path).toBe('reason');
    const stray = await post(shop.s.technician, `/safety/lockouts/${unverified}/test-windows`, openBody([crypto.randomUUID()])).expect(400);
    expect(stray.body.fields[0].path).toBe('removePointIds.0');
    expect(await countSignOffs(shop.orgId)).toBe(afterVerify);
    expect((await detail(unverified)).state).toBe('verified');

    await release(unverified).expect(201);
    const released = await post(shop.s.technician, `/safety/lockouts/${unverified}/test-windows`, openBody(uPoints)).expect(409);
    expect(released.body.fields[0].path).toBe('state');

    const actions = (await refusals()).map((r) => r.action);
    expect(actions.filter((a) => a === 'lockout.test-window').length).toBeGreaterThanOrEqual(6);
    expect((await refusals()).some((r) => r.reason === 'Clear the machine of tools and materials first (1910.147(f)(1)(i))')).toBe(true);
  });

  it('(f)(1)(v): refuses reapplying without a lock on every point, a lock hanging elsewhere, and resuming work before re-verification', async () => {
    const { id } = await verifiedLockout();
    const points = await active(id);
    const [e1, h1, pl1] = ['E1', 'H1', 'PL1'].map((k) => points.find((p) => p.sourceKey === k)!);
    await post(shop.s.technician, `/safety/lockouts/${id}/test-windows`, openBody([e1.id, pl1.id])).expect(201);
    const before = await countSignOffs(shop.orgId);

    // Work cannot start and the lockout cannot be released with the devices off.
    expect((await release(id).expect(409)).body.fields[0].path).toBe('state');
    // Re-verifying before the devices are back on.
    const early = await post(shop.s.technician, `/safety/lockouts/${id}/test-windows/reverify`, reverifyBody([h1.id])).expect(409);
    expect(early.body.message).toBe('The devices are off for testing or positioning: put them back on first');
    // Not every point that came off gets its lock back.
    const partial = await post(shop.s.technician, `/safety/lockouts/${id}/test-windows/reapply`, {
      locks: [{ pointId: e1.id, lockNumber: e1.lockNumber }],
      deEnergized: true,
      password: PASSWORD,
    }).expect(400);
    expect(partial.body.fields).toEqual([{ path: 'locks', message: expect.stringMatching(/missing: PL1$/) }]);
    // A lock cannot be in two places: H1's lock is still on H1.
    const twice = await post(shop.s.technician, `/safety/lockouts/${id}/test-windows/reapply`, {
      locks: [
        { pointId: e1.id, lockNumber: e1.lockNumber },
        { pointId: pl1.id, lockNumber: h1.lockNumber },
      ],
      deEnergized: true,
      password: PASSWORD,
    }).expect(409);
    expect(twice.body.fields[0].path).toBe('locks.1.lockNumber');
    expect(twice.body.message).toBe(`Lock ${h1.lockNumber} is already on C1 (H1)`);
    // Not de-energized.
    const live = await post(shop.s.technician, `/safety/lockouts/${id}/test-windows/reapply`, {
      locks: [
        { pointId: e1.id, lockNumber: e1.lockNumber },
        { pointId: pl1.id, lockNumber: pl1.lockNumber },
      ],
      deEnergized: false,
      password: PASSWORD,
    }).expect(400);
    expect(live.body.fields[0].path).toBe('deEnergized');
    // By someone else.
    await post(shop.s.safety, `/safety/lockouts/${id}/test-windows/reapply`, {
      locks: [
        { pointId: e1.id, lockNumber: 'X-1' },
        { pointId: pl1.id, lockNumber: 'X-2' },
      ],
      deEnergized: true,
      password: PASSWORD,
    }).expect(403);
    expect(await countSignOffs(shop.orgId)).toBe(before);

    await post(shop.s.technician, `/safety/lockouts/${id}/test-windows/reapply`, {
      locks: [
        { pointId: e1.id, lockNumber: e1.lockNumber },
        { pointId: pl1.id, lockNumber: pl1.lockNumber },
      ],
      deEnergized: true,
      password: PASSWORD,
    }).expect(201);
    const afterReapply = await countSignOffs(shop.orgId);
    // Resuming work before re-verification: nobody joins, no second window, the plain verify points to the re-verification.
    const join = await post(shop.s.safety, `/safety/lockouts/${id}/join`, { lockNumber: `J${uniq()}`, password: PASSWORD }).expect(409);
    expect(join.body.message).toMatch(/isolation is not verified again yet: verify it before you join and start work$/);
    await post(shop.s.technician, `/safety/lockouts/${id}/test-windows`, openBody([e1.id])).expect(409);
    const now = (await active(id)).map((p) => p.id);
    await post(shop.s.technician, `/safety/lockouts/${id}/verify`, reverifyBody(now)).expect(409);
    // Re-verification with a point not ticked.
    const untested = await post(shop.s.technician, `/safety/lockouts/${id}/test-windows/reverify`, reverifyBody(now.slice(1))).expect(400);
    expect(untested.body.fields[0].path).toBe('testedPointIds');
    expect(await countSignOffs(shop.orgId)).toBe(afterReapply);
    expect((await detail(id)).state).toBe('reapplied');

    const actions = new Set((await refusals()).map((r) => r.action));
    for (const a of ['lockout.test-reapply', 'lockout.test-reverify', 'lockout.join', 'lockout.release', 'lockout.verify']) expect(actions).toContain(a);

    await post(shop.s.technician, `/safety/lockouts/${id}/test-windows/reverify`, reverifyBody(now)).expect(201);
    await release(id).expect(201);
  });

  it('(f)(1)(ii) with (f)(3): a group lockout needs every member off or the holder to confirm they are clear', async () => {
    const { id } = await verifiedLockout(true);
    await post(shop.s.safety, `/safety/lockouts/${id}/join`, { lockNumber: `P${uniq()}`, password: PASSWORD }).expect(201);
    const e1 = (await active(id)).find((p) => p.sourceKey === 'E1')!;
    const refused = await post(shop.s.technician, `/safety/lockouts/${id}/test-windows`, openBody([e1.id])).expect(400);
    expect(refused.body.fields[0]).toMatchObject({
      path: 'membersClear',
      message: expect.stringMatching(/^Personal locks are still on this group lockout \(safety of/),
    });
    await post(shop.s.technician, `/safety/lockouts/${id}/test-windows`, openBody([e1.id], { membersClear: true })).expect(201);
    expect((await get(shop.s.operator, `/safety/lockouts/${id}/test-windows`).expect(200)).body[0].membersClear).toBe(true);
    await post(shop.s.technician, `/safety/lockouts/${id}/test-windows/reapply`, {
      locks: [{ pointId: e1.id, lockNumber: `R${uniq()}` }],
      deEnergized: true,
      password: PASSWORD,
    }).expect(201);
    await post(shop.s.technician, `/safety/lockouts/${id}/test-windows/reverify`, reverifyBody((await active(id)).map((p) => p.id))).expect(201);
    await post(shop.s.safety, `/safety/lockouts/${id}/leave`, { password: PASSWORD }).expect(201);
    await release(id).expect(201);
  });

  it('(f)(1)(iv): the machine reads as energized for testing under the lockout, still locked out for production', async () => {
    const { id } = await verifiedLockout();
    expect((await get(shop.s.operator, '/machines/C1/status').expect(200)).body).toMatchObject({ state: 'locked-out', reason: 'Replace the clamp' });
    const e1 = (await active(id)).find((p) => p.sourceKey === 'E1')!;
    await post(shop.s.technician, `/safety/lockouts/${id}/test-windows`, openBody([e1.id])).expect(201);
    const during = (await get(shop.s.operator, '/machines/C1/status').expect(200)).body;
    expect(during.state).toBe('locked-out');
    expect(during.reason).toBe(
      `Energized for testing under the lockout held by technician of ${shop.slug} (Replace the clamp) — locks off: Jog the ram once to check the new clamp seats`,
    );
    // The station page keeps the machine locked out for production and names the state.
    const station = (await get(shop.s.operator, '/stations/C1').expect(200)).body;
    expect(station.lockouts).toEqual([expect.objectContaining({ id, state: 'testing' })]);
    await post(shop.s.technician, `/safety/lockouts/${id}/test-windows/reapply`, {
      locks: [{ pointId: e1.id, lockNumber: e1.lockNumber }],
      deEnergized: true,
      password: PASSWORD,
    }).expect(201);
    expect((await get(shop.s.operator, '/machines/C1/status').expect(200)).body).toMatchObject({ state: 'locked-out', reason: 'Replace the clamp' });
    await post(shop.s.technician, `/safety/lockouts/${id}/test-windows/reverify`, reverifyBody((await active(id)).map((p) => p.id))).expect(201);
    await release(id).expect(201);
    expect((await get(shop.s.operator, '/machines/C1/status').expect(200)).body.state).toBe('in-service');
  });

  it('(f)(1)(iv)-(v): a counter rising inside the window is no alarm; rising after re-verification is', async () => {
    setClock('2027-04-06T09:00:00Z');
    const meter = (
      await post(shop.s.admin, '/meters', { machineId: shop.machineId, code: `strokes-${uniq()}`, name: 'Ram strokes', kind: 'count', unit: 'hits' }).expect(
        201,
      )
    ).body.id;
    const alarmsFor = async () =>
      ((await get(shop.s.safety, `/safety/events?kind=alarm&pageSize=100`).expect(200)).body.rows as { subjectId: string; reason: string }[]).filter(
        (a) => a.subjectId === id,
      );
    const read = async (at: string, value: number) => {
      setClock(at);
      await post(shop.s.operator, `/meters/${meter}/readings`, { value }).expect(201);
    };
    setClock('2027-04-06T09:01:00Z');
    const { id } = await verifiedLockout();
    await read('2027-04-06T09:05:00Z', 500);
    await read('2027-04-06T09:10:00Z', 500);
    setClock('2027-04-06T09:15:00Z');
    const e1 = (await active(id)).find((p) => p.sourceKey === 'E1')!;
    await post(shop.s.technician, `/safety/lockouts/${id}/test-windows`, openBody([e1.id])).expect(201);
    // Inside the window the ram is jogged on purpose: 500 → 503 → 504, no alarm.
    await read('2027-04-06T09:20:00Z', 503);
    await read('2027-04-06T09:25:00Z', 504);
    setClock('2027-04-06T09:30:00Z');
    await post(shop.s.technician, `/safety/lockouts/${id}/test-windows/reapply`, {
      locks: [{ pointId: e1.id, lockNumber: e1.lockNumber }],
      deEnergized: true,
      password: PASSWORD,
    }).expect(201);
    // Locks back on but not re-verified yet: not a verified interval either.
    await read('2027-04-06T09:32:00Z', 505);
    setClock('2027-04-06T09:35:00Z');
    await post(shop.s.technician, `/safety/lockouts/${id}/test-windows/reverify`, reverifyBody((await active(id)).map((p) => p.id))).expect(201);
    // 09:32 → 09:40 straddles the re-verification: not evidence (1910.147(d)(6)).
    await read('2027-04-06T09:40:00Z', 506);
    expect(await alarmsFor()).toEqual([]);
    // After re-verification the machine must not run: 506 → 510 is the alarm.
    await read('2027-04-06T09:45:00Z', 510);
    const alarms = await alarmsFor();
    expect(alarms).toHaveLength(1);
    expect(alarms[0].reason).toMatch(/C1 Ram strokes rose by 4 hits \(506 → 510\) while locked out and verified$/);
    await release(id).expect(201);
  });
});
