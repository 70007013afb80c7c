import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { makeShop, makeTestApp, post, signIn, type SignedIn, type TestShop } from '../setup/test-app';
import { MeterReading } from '../../server/modules/meters/meter.entity';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let a: TestShop;
let tech: SignedIn;
let dpId: string;
let tempId: string;

const upload = (s: SignedIn, url: string, csv: string) =>
  s.agent
    .post(`/api${url}`)
    .set('X-CSRF-Token', s.csrf)
    .set('Accept', 'application/json')
    .attach('file', Buffer.from(csv), { filename: 'counters.csv', contentType: 'text/csv' });

async function valuesOf(meterId: string) {
  const em = t.em();
  em.setFilterParams('org', { orgId: a.orgId });
  return (await em.find(MeterReading, { meter: meterId }, { orderBy: { readAt: 'asc' } })).map((r) => r.value);
}

beforeAll(async () => {
  t = await makeTestApp();
  a = await makeShop(t.em(), 'units');
  tech = await signIn(t.app, a.users.technician.email);
  const hu = (await post(tech, '/machines', { code: 'HU7', name: 'Hydraulic unit 7', kind: 'hydraulic-unit' }).expect(201)).body.id;
  dpId = (await post(tech, '/meters', { machineId: hu, code: 'filter-dp', name: 'Filter pressure drop', kind: 'condition', unit: 'kPa' }).expect(201)).body.id;
  tempId = (await post(tech, '/meters', { machineId: hu, code: 'oil-temp', name: 'Oil temperature', kind: 'condition', unit: '°C' }).expect(201)).body.id;
});
afterAll(() => t.close());

describe('units on entry and on import, stored in the meter’s unit', () => {
  it('converts a reading typed in psi or °F into the meter’s unit', async () => {
    await post(tech, `/meters/${dpId}/readings`, { value: 10, unit: 'psi', readAt: '2026-02-01T06:00:00Z' }).expect(201);
    await post(tech, `/meters/${tempId}/readings`, { value: 140, unit: '°F', readAt: '2026-02-01T06:00:00Z' }).expect(201);
    // NIST SP 811 App. B.8: 1 psi = 6.894 757 kPa → 10 psi = 68.947 57 kPa; App. B.9: 140 °F = 60 °C
    expect((await valuesOf(dpId))[0]).toBeCloseTo(68.94757, 6);
    expect((await valuesOf(tempId))[0]).toBeCloseTo(60, 9);
  });

  it('refuses an unknown unit, naming the field, with nothing written', async () => {
    const before = await valuesOf(dpId);
    const res = await post(tech, `/meters/${dpId}/readings`, { value: 3, unit: 'furlong', readAt: '2026-02-02T06:00:00Z' }).expect(400);
    expect(res.body.fields[0].path).toBe('unit');
    expect(res.body.fields[0].message).toMatch(/Unknown unit “furlong”/);
    const across = await post(tech, `/meters/${dpId}/readings`, { value: 3, unit: '°C', readAt: '2026-02-02T06:00:00Z' }).expect(400);
    expect(across.body.fields[0].path).toBe('unit');
    expect(await valuesOf(dpId)).toEqual(before);
  });

  it('converts the CSV’s unit column on import; an unknown unit refuses the file naming line and column', async () => {
    const csv = [
      'machine_code,meter_code,read_at,value,reset,unit',
      'HU7,filter-dp,2026-02-03T06:00:00Z,40,no,inH2O',
      'HU7,filter-dp,2026-02-04T06:00:00Z,0.5,no,bar',
    ].join('\n');
    await upload(tech, '/counter-import', csv).expect(200);
    // NIST SP 811 App. B.8: inch of water (39.2 °F) = 249.082 Pa → 40 inH2O = 9.963 28 kPa; 0.5 bar = 50 kPa
    const v = await valuesOf(dpId);
    expect(v[1]).toBeCloseTo(9.96328, 6);
    expect(v[2]).toBeCloseTo(50, 9);
    const bad = ['machine_code,meter_code,read_at,value,reset,unit', 'HU7,filter-dp,2026-02-05T06:00:00Z,40,no,furlong'].join('\n');
    const res = await upload(tech, '/counter-import', bad).expect(400);
    expect(res.body.fields[0].path).toBe('line 2 unit');
    expect(await valuesOf(dpId)).toHaveLength(3);
  });
});
