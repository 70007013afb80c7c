import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { randomUUID } from 'node:crypto';
import pg from 'pg';
import { makeShop, makeTestApp, post, signIn, type SignedIn, type TestShop } from '../setup/test-app';

// The readings table checks its shop, meter and recorder with triggers once per statement
// instead of per-row foreign keys; these tests hold it to what the foreign keys promised.
let t: Awaited<ReturnType<typeof makeTestApp>>;
let a: TestShop;
let b: TestShop;
let techA: SignedIn;
let meterA: string;
let meterB: string;
let db: pg.Client;

const upload = (s: SignedIn, csv: string) =>
  s.agent
    .post('/api/counter-import')
    .set('X-CSRF-Token', s.csrf)
    .set('Accept', 'application/json')
    .attach('file', Buffer.from(csv), { filename: 'counters.csv', contentType: 'text/csv' });

const countReadings = async (meterId: string) => Number((await db.query('select count(*) from meter_reading where meter_id = $1', [meterId])).rows[0].count);

/** Inserts readings as the app role inside a transaction that is always rolled back; returns the error, if any. */
async function tryInsert(rows: { org: string; meter: string; by: string | null }[]): Promise<{ code?: string; message: string } | null> {
  await db.query('begin');
  try {
    const values = rows.map(
      (_, i) => `($${i * 4 + 1}::uuid, now(), now(), $${i * 4 + 2}::uuid, $${i * 4 + 3}::uuid, 1, now(), 'manual', false, $${i * 4 + 4}::uuid)`,
    );
    await db.query(
      `insert into meter_reading (id, created_at, updated_at, organization_id, meter_id, value, read_at, source, is_reset, recorded_by_id) values ${values.join(', ')}`,
      rows.flatMap((r) => [randomUUID(), r.org, r.meter, r.by]),
    );
    return null;
  } catch (err) {
    return err as { code?: string; message: string };
  } finally {
    await db.query('rollback');
  }
}

beforeAll(async () => {
  t = await makeTestApp();
  a = await makeShop(t.em(), 'refs-a');
  b = await makeShop(t.em(), 'refs-b');
  techA = await signIn(t.app, a.users.technician.email);
  const techB = await signIn(t.app, b.users.technician.email);
  const torchA = (await post(techA, '/machines', { code: 'RA1-T', name: 'Torch A1', kind: 'torch' }).expect(201)).body.id;
  meterA = (await post(techA, '/meters', { machineId: torchA, code: 'arc-starts', name: 'Arc starts', kind: 'count', unit: 'starts' }).expect(201)).body.id;
  const torchB = (await post(techB, '/machines', { code: 'RB1-T', name: 'Torch B1', kind: 'torch' }).expect(201)).body.id;
  meterB = (await post(techB, '/meters', { machineId: torchB, code: 'arc-starts', name: 'Arc starts', kind: 'count', unit: 'starts' }).expect(201)).body.id;
  db = new pg.Client({ connectionString: t.config.DATABASE_URL });
  await db.connect();
});
afterAll(async () => {
  await db.end();
  await t.close();
});

describe('counter readings belong to their meter’s shop', () => {
  it('refuses an import naming another shop’s machine with 400 on its line, writing nothing in either shop', async () => {
    const csv = ['machine_code,meter_code,read_at,value', 'RA1-T,arc-starts,2026-02-01T06:00:00Z,10', 'RB1-T,arc-starts,2026-02-01T07:00:00Z,20'].join('\n');
    const res = await upload(techA, csv).expect(400);
    expect(res.body.fields[0]).toEqual({ path: 'line 3 machine_code', message: 'No machine with the code “RB1-T” in this shop' });
    expect(await countReadings(meterA)).toBe(0);
    expect(await countReadings(meterB)).toBe(0);
  });

  it('answers a reading typed for another shop’s meter with 404, not 500', async () => {
    await post(techA, `/meters/${meterB}/readings`, { value: 5, readAt: '2026-02-01T06:00:00Z' }).expect(404);
    expect(await countReadings(meterB)).toBe(0);
  });

  it('the database refuses a reading whose shop is not its meter’s, a missing meter and a missing recorder (whole statement)', async () => {
    expect(await tryInsert([{ org: a.orgId, meter: meterA, by: a.users.technician.userId }])).toBeNull();
    const crossShop = await tryInsert([
      { org: a.orgId, meter: meterA, by: a.users.technician.userId },
      { org: a.orgId, meter: meterB, by: a.users.technician.userId },
    ]);
    expect(crossShop?.code).toBe('23503');
    expect(crossShop?.message).toMatch(/belongs to another shop/);
    const noMeter = await tryInsert([{ org: a.orgId, meter: randomUUID(), by: null }]);
    expect(noMeter?.code).toBe('23503');
    expect(noMeter?.message).toMatch(/does not exist/);
    const noUser = await tryInsert([{ org: a.orgId, meter: meterA, by: randomUUID() }]);
    expect(noUser?.code).toBe('23503');
    expect(await countReadings(meterA)).toBe(0);
  });

  it('refuses moving a stored reading to another shop’s meter', async () => {
    await db.query('begin');
    try {
      await db.query(
        `insert into meter_reading (id, created_at, updated_at, organization_id, meter_id, value, read_at, source, is_reset) values ($1, now(), now(), $2, $3, 1, now(), 'manual', false)`,
        [randomUUID(), a.orgId, meterA],
      );
      await expect(db.query('update meter_reading set meter_id = $1 where meter_id = $2', [meterB, meterA])).rejects.toMatchObject({
        code: '23503',
        message: expect.stringMatching(/belongs to another shop/),
      });
    } finally {
      await db.query('rollback');
    }
  });

  it('a meter with readings cannot be deleted; a deleted person’s readings keep no recorder', async () => {
    await db.query('begin');
    try {
      const person = randomUUID();
      await db.query(`insert into app_user (id, created_at, updated_at, email, name) values ($1, now(), now(), $2, 'Passing Person')`, [
        person,
        `passing-${person.slice(0, 8)}@refs.example`,
      ]);
      const reading = randomUUID();
      await db.query(
        `insert into meter_reading (id, created_at, updated_at, organization_id, meter_id, value, read_at, source, is_reset, recorded_by_id) values ($1, now(), now(), $2, $3, 1, now(), 'manual', false, $4)`,
        [reading, a.orgId, meterA, person],
      );
      await db.query('delete from app_user where id = $1', [person]);
      expect((await db.query('select recorded_by_id from meter_reading where id = $1', [reading])).rows[0].recorded_by_id).toBeNull();
      await db.query('savepoint s');
      await expect(db.query('delete from meter where id = $1', [meterA])).rejects.toMatchObject({
        code: '23503',
        message: expect.stringMatching(/still has counter readings/),
      });
      await db.query('rollback to savepoint s');
      expect(await countReadings(meterA)).toBe(1);
    } finally {
      await db.query('rollback');
    }
  });
});
