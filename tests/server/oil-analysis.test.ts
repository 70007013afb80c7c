import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import type { MikroORM } from '@mikro-orm/postgresql';
import { makeShop, makeTestApp, signIn, type SignedIn, type TestShop } from '../setup/test-app';
import { initORM } from '../../server/db';
import { OilAnalysis } from '../../server/modules/oil-analysis/oil-analysis.entity';
import { get, makeMachine, planBody, post, put, scoped } from './work-orders-fixtures';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let orm: MikroORM;
let a: TestShop;
let admin: SignedIn;
let tech: SignedIn;
let op: SignedIn;
let unit: string;
let press: string;

const sample = (over: Record<string, unknown> = {}) => ({
  machineId: unit,
  sampledAt: '2026-05-04T09:00:00-05:00',
  labReference: 'L-2231',
  ge4um: 1000,
  ge6um: 300,
  ge14um: 30,
  viscosity40: 46.5,
  waterPpm: 120,
  temperatureC: 45,
  ...over,
});
const workFor = async (planId: string) => orm.em.fork().execute<{ id: string }[]>(`select id from work_order where plan_id = ?`, [planId]);

beforeAll(async () => {
  t = await makeTestApp();
  orm = await initORM();
  a = await makeShop(t.em(), 'oil');
  admin = await signIn(t.app, a.users.admin.email);
  tech = await signIn(t.app, a.users.technician.email);
  op = await signIn(t.app, a.users.operator.email);
  const em = scoped(t.em(), a.orgId);
  unit = await makeMachine(em, a.orgId, 'HU1', 'hydraulic-unit');
  press = await makeMachine(em, a.orgId, 'PB1', 'press-brake');
});
afterAll(() => t.close());

describe('oil analysis', () => {
  it('sets a target per hydraulic unit, with clear errors for bad targets', async () => {
    const bad = await put(tech, `/oil-units/${unit}/target`, { targetCode: '17-15-12', vgGrade: 45, waterLimitPpm: 0 }).expect(400);
    expect(bad.body.fields.map((f: { path: string }) => f.path).sort()).toEqual(['targetCode', 'vgGrade', 'waterLimitPpm']);
    await put(tech, `/oil-units/${press}/target`, { targetCode: '17/15/12', vgGrade: 46 }).expect(400);
    await put(tech, `/oil-units/${unit}/target`, { targetCode: '17/15/12', vgGrade: 46, waterLimitPpm: 500, temperatureLimitC: 60 }).expect(200);
    await put(op, `/oil-units/${unit}/target`, { targetCode: '17/15/12', vgGrade: 46 }).expect(403);
  });

  it('a result within targets is coded and raises nothing', async () => {
    const res = await post(tech, '/oil-analyses', sample()).expect(201);
    // ISO 4406:2021 Table 1: 1 000/mL → 17 (640 < n ≤ 1 300), 300 → 15 (160 < n ≤ 320), 30 → 12 (20 < n ≤ 40).
    expect(res.body).toMatchObject({ isoCode: '17/15/12', targetCode: '17/15/12', outOfLimits: false, viscosityBand: 'within', workOrder: null, findings: [] });
  });

  it('a result outside targets raises condition work once through the unit’s plan', async () => {
    const plan = await post(admin, '/plans', planBody(unit, { title: 'Act on oil result', triggers: [{ kind: 'oil-analysis' }] })).expect(201);
    const res = await post(
      tech,
      '/oil-analyses',
      sample({ sampledAt: '2026-08-03T09:00:00-05:00', ge4um: 3000, ge6um: 900, ge14um: 100, viscosity40: 52 }),
    ).expect(201);
    // 3 000/mL → 19, 900 → 17, 100 → 14 (ISO 4406:2021 Table 1): two steps over 17/15/12 at each size.
    // ISO 3448 VG 46: 41.4–50.6 mm²/s, so 52 is above the band (+13 %).
    expect(res.body.isoCode).toBe('19/17/14');
    expect(res.body.outOfLimits).toBe(true);
    expect(res.body.findings.map((f: { field: string; severity: string }) => `${f.field}:${f.severity}`)).toEqual(['cleanliness:danger', 'viscosity:danger']);
    expect(res.body.findings[1].message).toBe('Viscosity 52 mm²/s is above the ISO VG 46 band 41.4–50.6 mm²/s (+13 %)');
    const wos = await workFor(plan.body.id);
    expect(wos).toHaveLength(1);
    expect(res.body.workOrder.id).toBe(wos[0].id);
    // A second bad result while that work is open does not raise a second work order.
    await post(tech, '/oil-analyses', sample({ sampledAt: '2026-08-10T09:00:00-05:00', ge4um: 3000, ge6um: 900, ge14um: 100 })).expect(201);
    expect(await workFor(plan.body.id)).toHaveLength(1);
  });

  it('refuses counts that grow with particle size, with nothing written', async () => {
    const before = await scoped(t.em(), a.orgId).count(OilAnalysis, {});
    const res = await post(tech, '/oil-analyses', sample({ ge6um: 2000 })).expect(400);
    expect(res.body.fields).toEqual([{ path: 'ge6um', message: 'The ≥6 µm count cannot exceed the ≥4 µm count (counts are cumulative)' }]);
    await post(tech, '/oil-analyses', sample({ machineId: press })).expect(400);
    expect(await scoped(t.em(), a.orgId).count(OilAnalysis, {})).toBe(before);
  });

  it('lists results for trend charts and shows each unit with its latest result', async () => {
    const list = await get(op, `/oil-analyses?machineId=${unit}`).expect(200);
    expect(list.body.rows.map((r: { isoCode: string }) => r.isoCode)).toEqual(['19/17/14', '19/17/14', '17/15/12']);
    const units = await get(op, '/oil-units').expect(200);
    expect(units.body.units).toEqual([
      expect.objectContaining({
        code: 'HU1',
        target: expect.objectContaining({ targetCode: '17/15/12', vgGrade: 46 }),
        latest: expect.objectContaining({ sampledAt: '2026-08-10T14:00:00.000Z' }),
      }),
    ]);
    // Sortable by the sample date and by measured values (a value missing sorts last either way).
    const oldest = await get(op, `/oil-analyses?machineId=${unit}&sort=sampledAt&dir=asc`).expect(200);
    expect(oldest.body.rows.map((r: { isoCode: string }) => r.isoCode)).toEqual(['17/15/12', '19/17/14', '19/17/14']);
    await post(tech, '/oil-analyses', sample({ sampledAt: '2026-08-20T09:00:00-05:00', viscosity40: 41.2, waterPpm: null })).expect(201);
    const byWater = await get(op, `/oil-analyses?machineId=${unit}&sort=waterPpm&dir=desc`).expect(200);
    expect(byWater.body.rows.at(-1).waterPpm).toBeNull();
    const byViscosity = await get(op, `/oil-analyses?machineId=${unit}&sort=viscosity40&dir=asc`).expect(200);
    expect(byViscosity.body.rows[0].viscosity40).toBe(41.2);
    const bad = await get(op, '/oil-analyses?sort=colour').expect(400);
    expect(bad.body.fields[0].path).toBe('sort');
  });
});
