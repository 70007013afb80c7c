import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import type { MikroORM } from '@mikro-orm/postgresql';
import { makeShop, makeTestApp, signIn, type SignedIn, type TestShop } from '../setup/test-app';
import { initORM } from '../../server/db';
import { OilAnalysis } from '../../server/modules/oil-analysis/oil-analysis.entity';
import { get, makeMachine, planBody, post, put, scoped } from './work-orders-fixtures';
import { setClock } from '../../shared/clock';

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
  // The samples below are dated 2026; a later "now" keeps them in the past whenever the suite runs.
  setClock('2026-12-01T12:00:00Z');
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
afterAll(async () => {
  setClock(null);
  await t.close();
});

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
    // 3 000/mL → 19, 900 → 17, 100 → 14 (ISO 4406:2021 Table 1): two steps over 17/15/12 at each size → action (common practice).
    // No new-oil value recorded: the VG 46 mid-point (ISO 3448) stands in; 52 is +13 % → caution (±10 %, common practice), not action.
    expect(res.body.isoCode).toBe('19/17/14');
    expect(res.body.outOfLimits).toBe(true);
    expect(res.body.verdict).toBe('action');
    expect(res.body.findings.map((f: { field: string; severity: string }) => `${f.field}:${f.severity}`)).toEqual(['cleanliness:danger', 'viscosity:caution']);
    expect(res.body.findings[1].message).toBe(
      "Viscosity 52 mm²/s is +13 % from ISO VG 46's mid-point 46 mm²/s (no new-oil value recorded), at or beyond ±10 %",
    );
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

  it('one step over target is a caution and raises nothing; temperature is shown, not judged', async () => {
    const before = await orm.em.fork().execute<{ n: string }[]>(`select count(*) as n from work_order where machine_id = ?`, [unit]);
    // 1 000 → 17, 400 → 16 (320 < n ≤ 640), 30 → 12 (ISO 4406:2021 Table 1): one step over 17/15/12 on ≥6 µm.
    const res = await post(tech, '/oil-analyses', sample({ sampledAt: '2026-06-01T09:00:00-05:00', ge6um: 400, temperatureC: 71 })).expect(201);
    expect(res.body).toMatchObject({ isoCode: '17/16/12', verdict: 'caution', outOfLimits: false, workOrder: null, temperatureC: 71 });
    expect(res.body.findings.map((f: { field: string; severity: string }) => `${f.field}:${f.severity}`)).toEqual(['cleanliness:caution']);
    const after = await orm.em.fork().execute<{ n: string }[]>(`select count(*) as n from work_order where machine_id = ?`, [unit]);
    expect(after[0].n).toBe(before[0].n);
  });

  it('refuses a sample dated in the future and a bad target code, naming the field, with nothing written', async () => {
    const before = await scoped(t.em(), a.orgId).count(OilAnalysis, {});
    const res = await post(tech, '/oil-analyses', sample({ sampledAt: '2026-12-02T12:00:00Z' })).expect(400);
    expect(res.body.fields).toEqual([{ path: 'sampledAt', message: 'The sample cannot be taken in the future' }]);
    expect(await scoped(t.em(), a.orgId).count(OilAnalysis, {})).toBe(before);
    const badCode = await put(tech, `/oil-units/${unit}/target`, { targetCode: '15/17/12', vgGrade: 46 }).expect(400);
    expect(badCode.body.fields.map((f: { path: string }) => f.path)).toEqual(['targetCode']);
  });

  it('lists results for trend charts and shows each unit with its latest result', async () => {
    const list = await get(op, `/oil-analyses?machineId=${unit}`).expect(200);
    expect(list.body.rows.map((r: { isoCode: string }) => r.isoCode)).toEqual(['19/17/14', '19/17/14', '17/16/12', '17/15/12']);
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
    expect(oldest.body.rows.map((r: { isoCode: string }) => r.isoCode)).toEqual(['17/15/12', '17/16/12', '19/17/14', '19/17/14']);
    await post(tech, '/oil-analyses', sample({ sampledAt: '2026-08-20T09:00:00-05:00', viscosity40: 41.2, waterPpm: null })).expect(201);
    const byWater = await get(op, `/oil-analyses?machineId=${unit}&sort=waterPpm&dir=desc`).expect(200);
    expect(byWater.body.rows.at(-1).waterPpm).toBeNull();
    const byViscosity = await get(op, `/oil-analyses?machineId=${unit}&sort=viscosity40&dir=asc`).expect(200);
    expect(byViscosity.body.rows[0].viscosity40).toBe(41.2);
    const bad = await get(op, '/oil-analyses?sort=colour').expect(400);
    expect(bad.body.fields[0].path).toBe('sort');
  });

  it("judges viscosity against the new-oil value and a target with an unreported size, under the shop's thresholds", async () => {
    await put(tech, `/oil-units/${unit}/target`, { targetCode: '-/15/12', vgGrade: 46, baselineViscosityCst: 43, waterLimitPpm: 500 }).expect(200);
    // 43 → 50 mm²/s is +16.3 % (inside the VG 46 band 41.4–50.6, ISO 3448) → caution at ±10 % (common practice).
    const r1 = await post(tech, '/oil-analyses', sample({ sampledAt: '2026-09-01T09:00:00-05:00', ge4um: 9000, viscosity40: 50 })).expect(201);
    expect(r1.body.findings.map((f: { field: string; severity: string }) => `${f.field}:${f.severity}`)).toEqual(['viscosity:caution']);
    expect(r1.body.viscosityBand).toBe('caution');
    // The shop moves its thresholds: ±15/±30 % makes +16 % still a caution, steps 1/3 keep one step at caution.
    const bad = await put(admin, '/oil-settings', {
      cleanlinessCautionSteps: 2,
      cleanlinessActionSteps: 1,
      viscosityCautionPercent: 15,
      viscosityActionPercent: 30,
    }).expect(400);
    expect(bad.body.fields.map((f: { path: string }) => f.path)).toEqual(['cleanlinessActionSteps']);
    await put(tech, '/oil-settings', { cleanlinessCautionSteps: 1, cleanlinessActionSteps: 3, viscosityCautionPercent: 15, viscosityActionPercent: 30 }).expect(
      403,
    );
    await put(admin, '/oil-settings', {
      cleanlinessCautionSteps: 1,
      cleanlinessActionSteps: 3,
      viscosityCautionPercent: 20,
      viscosityActionPercent: 30,
    }).expect(200);
    expect((await get(op, '/oil-settings').expect(200)).body.settings.viscosityCautionPercent).toBe(20);
    // 1 000/900/100 → 17/17/14 against -/15/12: two steps over → caution under "action from 3"; +16 % → within under ±20 %.
    const r2 = await post(tech, '/oil-analyses', sample({ sampledAt: '2026-09-08T09:00:00-05:00', ge6um: 900, ge14um: 100, viscosity40: 50 })).expect(201);
    expect(r2.body).toMatchObject({ isoCode: '17/17/14', verdict: 'caution', outOfLimits: false, workOrder: null });
    expect(r2.body.findings.map((f: { field: string }) => f.field)).toEqual(['cleanliness']);
  });
});
