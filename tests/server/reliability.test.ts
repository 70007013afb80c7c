import { describe, it, expect, beforeAll, afterAll, afterEach } from 'vitest';
import type { MikroORM } from '@mikro-orm/postgresql';
import { makeTestApp, patch } from '../setup/test-app';
import { initORM } from '../../server/db';
import { setClock } from '../../shared/clock';
import { Machine } from '../../server/modules/machines/machine.entity';
import { get, makeSafetyShop, post, type SafetyShop } from './safety-helpers';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let orm: MikroORM;
let shop: SafetyShop;
let other: SafetyShop;
let brakeId: string;

beforeAll(async () => {
  t = await makeTestApp();
  orm = await initORM();
  shop = await makeSafetyShop(t.app, t.em(), 'rel');
  other = await makeSafetyShop(t.app, t.em(), 'rel-other');
  const em = t.em();
  const brake = em.create(Machine, { organization: shop.orgId, kind: 'press-brake', code: 'PB1', name: 'Press brake 1', active: true });
  await em.flush();
  brakeId = brake.id;
});
afterEach(() => setClock(null));
afterAll(async () => {
  await orm.close();
  await t.close();
});

/** Writes a stop as the service would have; the figures only read start, end, kind and codes. */
async function stop(machineId: string, kind: 'failure' | 'planned', start: string, end: string | null, codes: { failure?: string; cause?: string } = {}) {
  await orm.em.fork().execute(
    `insert into machine_downtime (id, created_at, updated_at, organization_id, machine_id, kind, reason, failure_code, cause_code, started_at, ended_at)
     values (gen_random_uuid(), now(), now(), ?, ?, ?, 'test stop', ?, ?, ?, ?)`,
    [shop.orgId, machineId, kind, codes.failure ?? null, codes.cause ?? null, start, end],
  );
}

describe('reliability report', () => {
  it('computes one machine over shop-local days, clipping and merging as the figures define', async () => {
    // The shop is in America/Chicago (UTC−6 in January): 2027-01-04..2027-01-13 is 06:00Z on the 4th to 06:00Z on the 14th = 240 h.
    setClock('2027-02-01T12:00:00Z');
    await stop(shop.machineId, 'failure', '2027-01-04T02:00:00Z', '2027-01-04T10:00:00Z', { failure: 'LEAK', cause: 'WORN' }); // 4 h inside
    await stop(shop.machineId, 'failure', '2027-01-06T10:00:00Z', '2027-01-06T14:00:00Z', { failure: 'LEAK', cause: 'HYDR' });
    await stop(shop.machineId, 'failure', '2027-01-06T12:00:00Z', '2027-01-06T16:00:00Z', { failure: 'LEAK', cause: 'HYDR' }); // merged: 6 h
    await stop(shop.machineId, 'planned', '2027-01-08T08:00:00Z', '2027-01-08T16:00:00Z'); // 8 h
    await stop(shop.machineId, 'failure', '2027-01-10T08:00:00Z', '2027-01-10T10:00:00Z', { failure: 'CTRL' }); // 2 h, no cause yet
    const res = await get(shop.s.operator, `/reliability?from=2027-01-04&to=2027-01-13&machineId=${shop.machineId}`).expect(200);
    const f = res.body.figures;
    // failures 3; down 4 + 6 + 2 = 12 h failure + 8 h planned; operating 220 h; MTBF 73.33 h; MTTR 4 h; availability 220 / 232
    expect(f.windowHours).toBe(240);
    expect(f.failures).toBe(3);
    expect(f.operatingHours).toBe(220);
    expect(f.mtbfHours).toBeCloseTo(73.3333, 4);
    expect(f.mttrHours).toBe(4);
    expect(f.availability).toBeCloseTo(220 / 232, 6);
    // Downtime by cause, largest first: HYDR 6 h, WORN 4 h, not coded 2 h
    expect(res.body.byCause.map((b: { code: string | null; hours: number }) => [b.code, b.hours])).toEqual([
      ['HYDR', 6],
      ['WORN', 4],
      [null, 2],
    ]);
    expect(res.body.downtimes).toHaveLength(5);

    // One failure mode: LEAK stops (2 after merging, 10 h) against the machine's own 220 operating hours.
    const leak = await get(shop.s.operator, `/reliability?from=2027-01-04&to=2027-01-13&machineId=${shop.machineId}&failureCode=leak`).expect(200);
    expect(leak.body.figures.failures).toBe(2);
    expect(leak.body.figures.mtbfHours).toBe(110);
    expect(leak.body.figures.mttrHours).toBe(5);
    expect(leak.body.downtimes).toHaveLength(3);
  });

  it('caps the window at now', async () => {
    setClock('2027-03-02T18:00:00Z'); // 12:00 shop time on the 2nd
    const res = await get(shop.s.operator, `/reliability?from=2027-03-01&to=2027-03-31&machineId=${shop.machineId}`).expect(200);
    // 06:00Z on 1 March to now = 36 h
    expect(res.body.figures.windowHours).toBeCloseTo(36, 3);
    expect(res.body.windowEnd.slice(0, 16)).toBe('2027-03-02T18:00');
  });

  it('refuses a reversed or unreadable window naming the field, and another shop’s machine', async () => {
    const reversed = await get(shop.s.operator, '/reliability?from=2027-01-10&to=2027-01-01').expect(400);
    expect(reversed.body.fields[0].path).toBe('to');
    const bad = await get(shop.s.operator, '/reliability?from=yesterday&to=2027-01-01').expect(400);
    expect(bad.body.fields[0].path).toBe('from');
    const long = await get(shop.s.operator, '/reliability?from=2020-01-01&to=2027-01-01').expect(400);
    expect(long.body.fields[0]).toMatchObject({ path: 'from', message: 'Choose a window of at most 1096 days' });
    await get(other.s.operator, `/reliability?from=2027-01-04&to=2027-01-13&machineId=${shop.machineId}`).expect(404);
  });
});

describe('failure codes', () => {
  it('starts each shop with the starter lists, lets technicians add and retire codes, and refuses duplicates', async () => {
    const list = await get(shop.s.operator, '/failure-codes').expect(200);
    expect(list.body.filter((c: { category: string }) => c.category === 'cause').map((c: { code: string }) => c.code)).toContain('WORN');
    const added = await post(shop.s.technician, '/failure-codes', { category: 'cause', code: 'slag', label: 'Slag build-up on the slats' }).expect(201);
    expect(added.body.code).toBe('SLAG');
    const dup = await post(shop.s.technician, '/failure-codes', { category: 'cause', code: 'SLAG', label: 'Again' }).expect(409);
    expect(dup.body.fields[0].path).toBe('code');
    await post(shop.s.operator, '/failure-codes', { category: 'cause', code: 'X1', label: 'Not allowed' }).expect(403);
    await patch(shop.s.technician, `/failure-codes/${added.body.id}`, { active: false }).expect(200);
    // A retired code is refused on new records.
    const stopRes = await post(shop.s.technician, '/machines/PT1/out-of-service', { reason: 'Slats full', kind: 'failure', failureCode: 'NOSTART' }).expect(
      201,
    );
    expect(stopRes.body.state).toBe('out-of-service');
    const [d] = await orm.em
      .fork()
      .execute<{ id: string }[]>(`select id from machine_downtime where machine_id = ? and ended_at is null`, [shop.otherMachineId]);
    const refused = await patch(shop.s.technician, `/downtimes/${d.id}`, { causeCode: 'SLAG' }).expect(400);
    expect(refused.body.fields[0].path).toBe('causeCode');
    await patch(shop.s.technician, `/downtimes/${d.id}`, { causeCode: 'DIRT', remedyCode: 'CLEAN' }).expect(200);
    await patch(other.s.technician, `/downtimes/${d.id}`, { causeCode: 'DIRT' }).expect(404);
    // Another shop's list is its own.
    const theirs = await get(other.s.operator, '/failure-codes').expect(200);
    expect(theirs.body.some((c: { code: string }) => c.code === 'SLAG')).toBe(false);
  });
});

describe('light-curtain check on a press brake', () => {
  it('passes at the ISO 13855 distance, and a failed check takes the brake out of service', async () => {
    // S = 2000 × 0.100 + 8 × (30 − 14) = 328 mm (ISO 13855:2010)
    const ok = await post(shop.s.technician, '/machines/PB1/light-curtain-checks', {
      stoppingTimeMs: 100,
      detectionCapabilityMm: 30,
      measuredDistanceMm: 340,
    }).expect(201);
    expect(ok.body).toMatchObject({ requiredDistanceMm: 328, pass: true, tookOutOfService: false });
    expect((await get(shop.s.operator, '/machines/PB1/status').expect(200)).body.state).toBe('in-service');
    const bad = await post(shop.s.technician, '/machines/PB1/light-curtain-checks', {
      stoppingTimeMs: 100,
      detectionCapabilityMm: 30,
      measuredDistanceMm: 300,
    }).expect(201);
    expect(bad.body).toMatchObject({ requiredDistanceMm: 328, pass: false, tookOutOfService: true });
    const status = await get(shop.s.operator, '/machines/PB1/status').expect(200);
    expect(status.body).toMatchObject({ state: 'out-of-service', reason: 'Light curtain 300 mm from the hazard; at least 328 mm needed' });
    const list = await get(shop.s.operator, '/machines/PB1/light-curtain-checks').expect(200);
    expect(list.body.map((c: { pass: boolean }) => c.pass)).toEqual([false, true]);
    expect(brakeId).toBeTruthy();
  });

  it('refuses d > 40 mm, a machine that is not a press brake, and bad numbers, naming the field', async () => {
    const wide = await post(shop.s.technician, '/machines/PB1/light-curtain-checks', {
      stoppingTimeMs: 100,
      detectionCapabilityMm: 50,
      measuredDistanceMm: 900,
    }).expect(400);
    expect(wide.body.fields[0].path).toBe('detectionCapabilityMm');
    expect(wide.body.message).toMatch(/above 40 mm/);
    const notBrake = await post(shop.s.technician, '/machines/C1/light-curtain-checks', {
      stoppingTimeMs: 100,
      detectionCapabilityMm: 30,
      measuredDistanceMm: 400,
    }).expect(400);
    expect(notBrake.body.fields[0].path).toBe('code');
    const nan = await post(shop.s.technician, '/machines/PB1/light-curtain-checks', {
      stoppingTimeMs: -1,
      detectionCapabilityMm: 'x',
      measuredDistanceMm: 400,
    }).expect(400);
    expect(nan.body.fields.map((f: { path: string }) => f.path).sort()).toEqual(['detectionCapabilityMm', 'stoppingTimeMs']);
    await post(shop.s.operator, '/machines/PB1/light-curtain-checks', { stoppingTimeMs: 100, detectionCapabilityMm: 30, measuredDistanceMm: 400 }).expect(403);
    await post(other.s.technician, '/machines/PB1/light-curtain-checks', { stoppingTimeMs: 100, detectionCapabilityMm: 30, measuredDistanceMm: 400 }).expect(
      404,
    );
  });
});
