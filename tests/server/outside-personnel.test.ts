// Outside personnel servicing a locked-out machine, OSHA 29 CFR 1910.147(f)(2): the two employers
// inform each other of their energy-control procedures ((f)(2)(i)), the on-site employer's affected
// employees are told of the outside restrictions ((f)(2)(ii)), and outside locks count like our own
// (a lock is in one place; the lockout is not released while they are on, 1910.147(e)(3)).
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { makeTestApp } from '../setup/test-app';
import { approvedProcedure, countSignOffs, get, lockPoints, makeSafetyShop, PASSWORD, post, type SafetyShop } from './safety-helpers';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let shop: SafetyShop;
let procId: string;

beforeAll(async () => {
  t = await makeTestApp();
  shop = await makeSafetyShop(t.app, t.em(), 'outside');
  procId = await approvedProcedure(shop);
});
afterAll(() => t.close());

const uniq = () => Math.random().toString(36).slice(2, 6).toUpperCase();
const applyLockout = async (prefix = `O${uniq()}`) =>
  (
    await post(shop.s.technician, '/safety/lockouts', {
      procedureId: procId,
      reason: 'Rebuild the punch head',
      points: lockPoints(prefix),
      password: PASSWORD,
    }).expect(201)
  ).body.id as string;
const register = (lockoutId: string, overrides: Record<string, unknown> = {}) =>
  post(shop.s.technician, `/safety/lockouts/${lockoutId}/outside-parties`, {
    company: 'Quillfeather Hydraulic Services',
    leadName: 'Ona Brisk',
    leadContact: 'ona.brisk@quillfeather.example',
    procedureTitle: 'Field energy isolation, QH-EC-04',
    procedureVersion: 'rev 3',
    lockNumbers: [`QH-${uniq()}`, `QH-${uniq()}`],
    theirProcedureReviewed: true,
    ourProcedureGiven: true,
    password: PASSWORD,
    ...overrides,
  });
const refusals = async () =>
  (await get(shop.s.safety, '/safety/events?kind=refused&pageSize=100').expect(200)).body.rows as { action: string; reason: string }[];
const parties = async (lockoutId: string) => (await get(shop.s.operator, `/safety/lockouts/${lockoutId}/outside-parties`).expect(200)).body;
const release = (lockoutId: string) =>
  post(shop.s.technician, `/safety/lockouts/${lockoutId}/release`, { areaChecked: true, peopleClear: true, affectedNotified: true, password: PASSWORD });

describe('outside personnel on a lockout', () => {
  it('signs each step into the chain, counts their locks, and holds the release until their locks are off (1910.147(f)(2)(i), (f)(2)(ii))', async () => {
    const lockoutId = await applyLockout();
    const start = await countSignOffs(shop.orgId);
    const reg = await register(lockoutId).expect(201);
    const partyId = reg.body.id as string;
    let [p] = await parties(lockoutId);
    expect(p).toMatchObject({
      company: 'Quillfeather Hydraulic Services',
      leadName: 'Ona Brisk',
      locksOn: false,
      open: expect.arrayContaining(['lead-acknowledged']),
    });
    const [lockA, lockB] = p.lockNumbers as string[];

    // (f)(2)(i): the lead has no account; the on-site person types their acknowledgement and signs as witness.
    await post(shop.s.technician, `/safety/outside-parties/${partyId}/acknowledge`, {
      leadNameTyped: 'ona brisk',
      acknowledgement: 'I have read the shop procedure for C1 and my crew will follow it.',
      password: PASSWORD,
    }).expect(201);
    // (f)(2)(ii): our affected employees told of their restrictions (the safety officer may sign it too).
    await post(shop.s.safety, `/safety/outside-parties/${partyId}/inform`, {
      restrictions: 'Nobody touches the hydraulic unit while their tags are on; stay outside the taped area.',
      informedWho: 'Operators of C1, both shifts',
      password: PASSWORD,
    }).expect(201);
    await post(shop.s.technician, `/safety/outside-parties/${partyId}/locks-on`, { password: PASSWORD }).expect(201);

    // Their locks are in the lock register, and a lock cannot be in two places.
    const reg2 = (await get(shop.s.operator, `/safety/locks?q=${lockA}`).expect(200)).body.rows;
    expect(reg2[0]).toMatchObject({ lockNumber: lockA, holderName: 'Ona Brisk (Quillfeather Hydraulic Services)' });
    expect(reg2[0].current).toMatchObject({ machineCode: 'C1', where: 'Quillfeather Hydraulic Services lock', personal: true });
    const clash = await post(shop.s.safety, '/safety/lockouts', {
      procedureId: procId,
      reason: 'Second job on the cell',
      points: lockPoints(`X${uniq()}`).map((pt, i) => (i === 0 ? { ...pt, lockNumber: lockB } : pt)),
      password: PASSWORD,
    }).expect(409);
    expect(clash.body.message).toBe(`Lock ${lockB} is already on C1 (Quillfeather Hydraulic Services lock)`);

    // Release with their locks on: refused, naming the field, nothing written, audited.
    const before = await countSignOffs(shop.orgId);
    const held = await release(lockoutId).expect(409);
    expect(held.body.fields).toEqual([{ path: 'outsideLocks', message: `Still on: ${lockA}, ${lockB}` }]);
    expect(await countSignOffs(shop.orgId)).toBe(before);
    expect((await get(shop.s.operator, `/safety/lockouts/${lockoutId}`).expect(200)).body.state).toBe('locked');
    expect((await refusals())[0]).toMatchObject({ action: 'lockout.release', reason: expect.stringMatching(/Outside personnel's locks are still on/) });

    // Their lead removes their locks, witnessed; then the lockout is released.
    await post(shop.s.technician, `/safety/outside-parties/${partyId}/locks-off`, { removedByTheirLead: true, peopleClear: true, password: PASSWORD }).expect(
      201,
    );
    [p] = await parties(lockoutId);
    expect(p.locksOn).toBe(false);
    expect(p.steps.map((s: { step: string }) => s.step)).toEqual([
      'procedures-exchanged',
      'lead-acknowledged',
      'restrictions-informed',
      'locks-applied',
      'locks-removed',
    ]);
    expect((await get(shop.s.operator, `/safety/locks?q=${lockA}`).expect(200)).body.rows[0].current).toBeNull();
    await release(lockoutId).expect(201);

    // Five signed steps on the chain, each with its own meaning, and the chain verifies.
    expect(await countSignOffs(shop.orgId)).toBe(start + 6);
    const signed = (await get(shop.s.safety, '/safety/sign-offs?pageSize=20').expect(200)).body.rows.filter(
      (r: { subjectId: string }) => r.subjectId === partyId,
    );
    expect(signed.map((r: { meaning: string }) => r.meaning).sort()).toEqual(
      [
        'outside-locks-applied',
        'outside-locks-removed',
        'outside-procedure-acknowledged',
        'outside-procedures-exchanged',
        'outside-restrictions-informed',
      ].sort(),
    );
    const ack = signed.find((r: { meaning: string }) => r.meaning === 'outside-procedure-acknowledged');
    expect(ack.statement).toMatch(/witnessed the outside lead/);
    expect(ack.machineCode).toBe('C1');
    expect((await get(shop.s.safety, '/safety/chain/verify').expect(200)).body.ok).toBe(true);
  });

  it('refuses missing exchange, acknowledgement and restrictions with the field named, writes nothing and audits each refusal (1910.147(f)(2))', async () => {
    const lockoutId = await applyLockout();
    const audited = (await refusals()).length;
    let signed = await countSignOffs(shop.orgId);

    const unreviewed = await register(lockoutId, { theirProcedureReviewed: false }).expect(400);
    expect(unreviewed.body.fields.map((f: { path: string }) => f.path)).toEqual(['theirProcedureReviewed']);
    expect(await parties(lockoutId)).toEqual([]);

    const partyId = (await register(lockoutId).expect(201)).body.id as string;
    signed += 1;
    // Locks before the acknowledgement: refused, naming both missing steps.
    const early = await post(shop.s.technician, `/safety/outside-parties/${partyId}/locks-on`, { password: PASSWORD }).expect(409);
    expect(early.body.fields.map((f: { path: string }) => f.path)).toEqual(['acknowledgement', 'restrictionsInformed']);
    // An acknowledgement with the wrong name and no words.
    const noAck = await post(shop.s.technician, `/safety/outside-parties/${partyId}/acknowledge`, { leadNameTyped: 'Someone Else', password: PASSWORD }).expect(
      400,
    );
    expect(noAck.body.fields.map((f: { path: string }) => f.path)).toEqual(['leadNameTyped', 'acknowledgement']);
    const noInform = await post(shop.s.technician, `/safety/outside-parties/${partyId}/inform`, {
      restrictions: '',
      informedWho: '',
      password: PASSWORD,
    }).expect(400);
    expect(noInform.body.fields.map((f: { path: string }) => f.path)).toEqual(['restrictions', 'informedWho']);
    // Locks off that were never on.
    await post(shop.s.technician, `/safety/outside-parties/${partyId}/locks-off`, { removedByTheirLead: true, peopleClear: true, password: PASSWORD }).expect(
      409,
    );
    // An operator (an affected, not authorized, employee) cannot sign these steps; a wrong password signs nothing.
    await post(shop.s.operator, `/safety/outside-parties/${partyId}/inform`, { restrictions: 'x x x x x', informedWho: 'me', password: PASSWORD }).expect(403);
    await post(shop.s.technician, `/safety/outside-parties/${partyId}/inform`, { restrictions: 'x x x x x', informedWho: 'me', password: 'nope' }).expect(401);

    expect(await countSignOffs(shop.orgId)).toBe(signed);
    const [p] = await parties(lockoutId);
    expect(p.steps.map((s: { step: string }) => s.step)).toEqual(['procedures-exchanged']);
    expect(p).toMatchObject({ acknowledgement: null, restrictions: null, locksOn: false });
    const events = await refusals();
    expect(events.length).toBe(audited + 5);
    expect(events.slice(0, 5).map((e) => e.action)).toEqual([
      'lockout.outside.locks-off',
      'lockout.outside.inform',
      'lockout.outside.acknowledge',
      'lockout.outside.locks-on',
      'lockout.outside.register',
    ]);
    // Nothing of the refusals kept the lockout from being released: the party never had locks on.
    await release(lockoutId).expect(201);
    // A released lockout takes no new outside party.
    await register(lockoutId).expect(409);
  });

  it('an absent holder’s lock removal does not end the lockout under outside locks (1910.147(e)(3), (f)(2))', async () => {
    const lockoutId = await applyLockout();
    const partyId = (await register(lockoutId).expect(201)).body.id;
    await post(shop.s.technician, `/safety/outside-parties/${partyId}/acknowledge`, {
      leadNameTyped: 'Ona Brisk',
      acknowledgement: 'Understood; we work to your procedure.',
      password: PASSWORD,
    }).expect(201);
    await post(shop.s.technician, `/safety/outside-parties/${partyId}/inform`, {
      restrictions: 'Keep clear of the cell.',
      informedWho: 'C1 operators',
      password: PASSWORD,
    }).expect(201);
    await post(shop.s.technician, `/safety/outside-parties/${partyId}/locks-on`, { password: PASSWORD }).expect(201);
    const removal = await post(shop.s.admin, `/safety/lockouts/${lockoutId}/absent-removals`, {
      absentUserId: shop.users.technician.userId,
      note: 'Badge record shows them off site',
      notOnSite: true,
      password: PASSWORD,
    }).expect(201);
    const step = (who: typeof shop.s.admin, name: string) =>
      post(who, `/safety/absent-removals/${removal.body.id}/steps`, { step: name, note: 'Done as recorded', password: PASSWORD });
    await step(shop.s.admin, 'contact-attempted').expect(201);
    await step(shop.s.safety, 'removal-authorized').expect(201);
    const before = await countSignOffs(shop.orgId);
    const held = await step(shop.s.admin, 'locks-removed').expect(409);
    expect(held.body.fields.map((f: { path: string }) => f.path)).toEqual(['outsideLocks']);
    expect(await countSignOffs(shop.orgId)).toBe(before);
    const d = (await get(shop.s.operator, `/safety/lockouts/${lockoutId}`).expect(200)).body;
    expect(d.state).toBe('locked');
    expect(d.points.every((p: { removedAt: string | null }) => p.removedAt === null)).toBe(true);
    // The lockout's own list of signatures carries the outside steps too.
    expect(d.signOffs.map((x: { meaning: string }) => x.meaning)).toEqual(
      expect.arrayContaining(['outside-procedures-exchanged', 'outside-procedure-acknowledged', 'outside-locks-applied']),
    );
  });

  it('refuses outside locks already hanging elsewhere, naming the lock (1910.147(c)(5)(ii)(C)(1))', async () => {
    const prefix = `Z${uniq()}`;
    await applyLockout(prefix);
    const lockoutId = await applyLockout();
    const partyId = (await register(lockoutId, { lockNumbers: ['QH-FREE-1', `${prefix}-02`] }).expect(201)).body.id;
    await post(shop.s.technician, `/safety/outside-parties/${partyId}/acknowledge`, {
      leadNameTyped: 'Ona Brisk',
      acknowledgement: 'Read and understood, crew briefed.',
      password: PASSWORD,
    }).expect(201);
    await post(shop.s.technician, `/safety/outside-parties/${partyId}/inform`, {
      restrictions: 'Keep clear of the cell.',
      informedWho: 'C1 operators',
      password: PASSWORD,
    }).expect(201);
    const before = await countSignOffs(shop.orgId);
    const clash = await post(shop.s.technician, `/safety/outside-parties/${partyId}/locks-on`, { password: PASSWORD }).expect(409);
    expect(clash.body.fields).toEqual([{ path: 'lockNumbers.1', message: `Lock ${prefix}-02 is already on C1 (H1)` }]);
    expect(await countSignOffs(shop.orgId)).toBe(before);
  });
});
