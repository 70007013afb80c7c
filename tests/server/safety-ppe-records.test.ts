import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { makeTestApp } from '../setup/test-app';
import {
  approvedProcedure,
  cellProcedure,
  countSignOffs,
  get,
  makeSafetyShop,
  PASSWORD,
  post,
  put,
  shopToday,
  superuser,
  type SafetyShop,
} from './safety-helpers';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let shop: SafetyShop;
let other: SafetyShop;

beforeAll(async () => {
  t = await makeTestApp();
  shop = await makeSafetyShop(t.app, t.em(), 'ppe');
  other = await makeSafetyShop(t.app, t.em(), 'ppe-other');
});
afterAll(() => t.close());

const requirement = (over: Record<string, unknown> = {}) => ({
  machineId: shop.machineId,
  task: 'Plasma cutting',
  items: ['safety-glasses', 'cut-resistant-gloves', 'safety-footwear'],
  otherItems: [],
  arcCurrentA: 260,
  noise: [],
  cadence: 'shift',
  ...over,
});

describe('PPE requirements', () => {
  it('derives the filter-lens shade from the arc current, with its source', async () => {
    const made = await post(shop.s.safety, '/safety/ppe/requirements', requirement({ task: 'Cutting 260 A' })).expect(201);
    const mid = await post(shop.s.safety, '/safety/ppe/requirements', requirement({ task: 'Cutting 300 A', arcCurrentA: 300 })).expect(201);
    const heavy = await post(shop.s.safety, '/safety/ppe/requirements', requirement({ task: 'Cutting 400 A', arcCurrentA: 400 })).expect(201);
    const list = (await get(shop.s.operator, '/safety/ppe/requirements').expect(200)).body as {
      id: string;
      shade: { minimum: number; suggested: number; source: string };
      required: { code: string; detail: string | null }[];
    }[];
    const byId = new Map(list.map((r) => [r.id, r]));
    // OSHA 29 CFR 1910.133(a)(5): below 300 A minimum 8; 300-400 A 9; 400-800 A 10 (400 A belongs to the darker band).
    expect(byId.get(made.body.id)!.shade).toMatchObject({ minimum: 8, suggested: 9 });
    expect(byId.get(mid.body.id)!.shade).toMatchObject({ minimum: 9, suggested: 12 });
    expect(byId.get(heavy.body.id)!.shade).toMatchObject({ minimum: 10, suggested: 14 });
    expect(byId.get(made.body.id)!.shade.source).toMatch(/OSHA 29 CFR 1910\.133\(a\)\(5\)/);
    const lens = byId.get(made.body.id)!.required.find((i) => i.code === 'filter-lens');
    expect(lens?.detail).toBe('Shade 8 or darker at 260 A (suggested 9)');
    // Above the table: refused instead of posting no shade at all.
    const over = await post(shop.s.safety, '/safety/ppe/requirements', requirement({ arcCurrentA: 900 })).expect(400);
    expect(over.body.fields[0].path).toBe('arcCurrentA');
    expect(over.body.fields[0].message).toMatch(/above the table/);
  });

  it('requires hearing protection from the noise dose, and follows the site threshold', async () => {
    // 4 h at 92 dBA + 4 h at 85 dBA: D = 100·(4/6.06 + 4/16) = 91.0 %, TWA = 16.61·log10(0.910)+90 = 89.3 dBA (29 CFR 1910.95 App. A).
    const made = await post(
      shop.s.safety,
      '/safety/ppe/requirements',
      requirement({
        task: 'Punching',
        arcCurrentA: null,
        noise: [
          { levelDbA: 92, hours: 4 },
          { levelDbA: 85, hours: 4 },
        ],
      }),
    ).expect(201);
    // 8 h at 82 dBA: T = 8/2^((82-90)/5) = 24.3 h, D = 33.0 %, TWA 82.0 dBA: below the 85 dBA action level.
    const quiet = await post(
      shop.s.safety,
      '/safety/ppe/requirements',
      requirement({ task: 'Bending', arcCurrentA: null, noise: [{ levelDbA: 82, hours: 8 }] }),
    ).expect(201);
    let list = (await get(shop.s.operator, '/safety/ppe/requirements').expect(200)).body as {
      id: string;
      hearing: { dosePercent: number; twaDbA: number; required: boolean; ruleSource: string };
      required: { code: string }[];
    }[];
    let loud = list.find((r) => r.id === made.body.id)!;
    expect(loud.hearing.dosePercent).toBeCloseTo(91.0, 0);
    expect(loud.hearing.twaDbA).toBeCloseTo(89.3, 1);
    expect(loud.hearing.required).toBe(true);
    expect(loud.required.map((i) => i.code)).toContain('hearing-protection');
    let calm = list.find((r) => r.id === quiet.body.id)!;
    expect(calm.hearing.dosePercent).toBeCloseTo(33.0, 0);
    expect(calm.hearing.twaDbA).toBeCloseTo(82.0, 1);
    expect(calm.required.map((i) => i.code)).not.toContain('hearing-protection');

    // A site that follows a stricter local rule (80 dBA) overrides the threshold and names its source.
    const settings = (await get(shop.s.safety, '/safety/settings').expect(200)).body;
    const { defaults: _d, ...current } = settings;
    await put(shop.s.operator, '/safety/settings', { ...current, hearingRequiredFromDbA: 80 }).expect(403);
    const bad = await put(shop.s.safety, '/safety/settings', { ...current, hearingRequiredFromDbA: 95 }).expect(400);
    expect(bad.body.fields[0]).toEqual({ path: 'hearingRequiredFromDbA', message: 'At most 90 dBA (the OSHA PEL)' });
    await put(shop.s.safety, '/safety/settings', {
      ...current,
      hearingRequiredFromDbA: 80,
      hearingRuleSource: 'Site rule: lower exposure action value 80 dB(A)',
    }).expect(200);
    list = (await get(shop.s.operator, '/safety/ppe/requirements').expect(200)).body;
    calm = list.find((r) => r.id === quiet.body.id)!;
    expect(calm.hearing.required).toBe(true);
    expect(calm.hearing.ruleSource).toBe('Site rule: lower exposure action value 80 dB(A)');
    loud = list.find((r) => r.id === made.body.id)!;
    expect(loud.required.map((i) => i.code)).toContain('hearing-protection');
    await put(shop.s.safety, '/safety/settings', current).expect(200);
  });

  it('takes a site shade table, validated, and uses it', async () => {
    const settings = (await get(shop.s.safety, '/safety/settings').expect(200)).body;
    const { defaults: _d, ...current } = settings;
    const gap = {
      source: 'Local table',
      notes: [],
      bands: [
        { label: 'low', fromA: 0, toA: 100, minimum: 6, suggested: 8 },
        { label: 'high', fromA: 150, toA: 800, minimum: 10, suggested: 12 },
      ],
    };
    const res = await put(shop.s.safety, '/safety/settings', { ...current, shadeTable: gap }).expect(400);
    expect(res.body.fields[0].path).toBe('shadeTable');
    expect(res.body.message).toMatch(/gap between band 0/);
    const finer = {
      source: 'ANSI Z49.1:2012 finer plasma bands (site choice)',
      notes: [],
      bands: [
        { label: 'up to 100 A', fromA: 0, toA: 100, minimum: 6, suggested: 8 },
        { label: '100-800 A', fromA: 100, toA: 800, minimum: 9, suggested: 12 },
      ],
    };
    await put(shop.s.safety, '/safety/settings', { ...current, shadeTable: finer }).expect(200);
    const made = await post(shop.s.safety, '/safety/ppe/requirements', requirement({ task: 'Fine cutting', arcCurrentA: 80 })).expect(201);
    const row = (
      (await get(shop.s.operator, '/safety/ppe/requirements').expect(200)).body as {
        id: string;
        shade: { minimum: number; siteOverride: boolean; source: string };
      }[]
    ).find((r) => r.id === made.body.id)!;
    expect(row.shade).toMatchObject({ minimum: 6, siteOverride: true, source: 'ANSI Z49.1:2012 finer plasma bands (site choice)' });
    await put(shop.s.safety, '/safety/settings', { ...current, shadeTable: null }).expect(200);
  });

  it('accepts a PPE check only with every required item tapped, and refuses other shops', async () => {
    const made = await post(shop.s.safety, '/safety/ppe/requirements', requirement({ task: 'Check test' })).expect(201);
    const before = await countSignOffs(shop.orgId);
    const res = await post(shop.s.operator, '/safety/ppe/checks', {
      requirementId: made.body.id,
      confirmed: ['safety-glasses', 'safety-footwear'],
      password: PASSWORD,
    }).expect(400);
    expect(res.body.fields[0].path).toBe('confirmed');
    expect(res.body.message).toBe(
      'Do not start: put on filter lens (cutting goggles, shield or helmet), cut-resistant gloves for sheet handling first, then sign',
    );
    await post(other.s.operator, '/safety/ppe/checks', { requirementId: made.body.id, confirmed: [], password: PASSWORD }).expect(404);
    await post(shop.s.admin, '/safety/ppe/checks', { requirementId: made.body.id, confirmed: [], password: PASSWORD }).expect(403);
    expect(await countSignOffs(shop.orgId)).toBe(before);
    await post(shop.s.operator, '/safety/ppe/checks', {
      requirementId: made.body.id,
      confirmed: ['safety-glasses', 'filter-lens', 'cut-resistant-gloves', 'safety-footwear'],
      password: PASSWORD,
    }).expect(201);
    const sig = await get(shop.s.safety, '/safety/sign-offs?meaning=ppe-check-done').expect(200);
    expect(sig.body.rows[0]).toMatchObject({
      signerName: `operator of ${shop.slug}`,
      machineCode: 'C1',
      statement: 'I am wearing every item of PPE this task requires, in good condition.',
    });
    expect(sig.body.rows[0].summary).toContain('Filter lens shade 8+');
  });
});

describe('periodic inspection and training', () => {
  it('refuses an inspector who uses the procedure, and lets only the safety officer certify', async () => {
    const procId = await approvedProcedure(shop, cellProcedure('Inspected procedure'));
    const today = shopToday();
    const body = {
      procedureId: procId,
      inspectedOn: today,
      employeeIds: [shop.users.technician.userId],
      findings: 'Procedure followed at every step.',
      responsibilitiesReviewed: true,
      password: PASSWORD,
    };
    const self = await post(shop.s.technician, '/safety/inspections', body).expect(400);
    expect(self.body.fields[0].path).toBe('employeeIds');
    expect(self.body.message).toMatch(/other than the ones using the procedure \(1910\.147\(c\)\(6\)\(i\)\(A\)\)/);
    await post(shop.s.operator, '/safety/inspections', body).expect(403);
    const noReview = await post(shop.s.safety, '/safety/inspections', { ...body, responsibilitiesReviewed: false }).expect(400);
    expect(noReview.body.fields[0].path).toBe('responsibilitiesReviewed');
    const future = await post(shop.s.safety, '/safety/inspections', { ...body, inspectedOn: '2999-01-01' }).expect(400);
    expect(future.body.fields[0]).toEqual({ path: 'inspectedOn', message: 'The date cannot be in the future' });
    const made = await post(shop.s.safety, '/safety/inspections', body).expect(201);
    await post(shop.s.technician, `/safety/inspections/${made.body.id}/certify`, { password: PASSWORD }).expect(403);
    await post(other.s.safety, `/safety/inspections/${made.body.id}/certify`, { password: PASSWORD }).expect(404);
    await post(shop.s.safety, `/safety/inspections/${made.body.id}/certify`, { password: 'nope' }).expect(401);
    await post(shop.s.safety, `/safety/inspections/${made.body.id}/certify`, { password: PASSWORD }).expect(201);
    await post(shop.s.safety, `/safety/inspections/${made.body.id}/certify`, { password: PASSWORD }).expect(409);
    const list = (await get(shop.s.operator, '/safety/inspections').expect(200)).body;
    expect(list[0]).toMatchObject({
      inspectorName: `safety of ${shop.slug}`,
      certifiedByName: `safety of ${shop.slug}`,
      employees: [{ name: `technician of ${shop.slug}` }],
    });
    const procs = (await get(shop.s.operator, '/safety/procedures').expect(200)).body.find((p: { id: string }) => p.id === procId);
    expect(procs.lastInspectionAt).toBe(today);
  });

  it('marks training for retraining when a changed procedure asks for it', async () => {
    const procId = await approvedProcedure(shop, cellProcedure('Trained procedure'), shop.machineId, []);
    const today = shopToday();
    const affectedAsAuthorized = await post(shop.s.safety, '/safety/training', {
      userId: shop.users.operator.userId,
      procedureId: procId,
      kind: 'authorized',
      trainedOn: today,
      password: PASSWORD,
    }).expect(400);
    expect(affectedAsAuthorized.body.fields[0].path).toBe('kind');
    await post(shop.s.safety, '/safety/training', {
      userId: shop.users.operator.userId,
      procedureId: procId,
      kind: 'affected',
      trainedOn: today,
      password: PASSWORD,
    }).expect(201);
    await post(shop.s.safety, '/safety/training', {
      userId: shop.users.technician.userId,
      procedureId: procId,
      kind: 'authorized',
      trainedOn: today,
      password: PASSWORD,
    }).expect(201);
    await post(shop.s.safety, '/safety/training', {
      userId: other.users.technician.userId,
      procedureId: procId,
      kind: 'authorized',
      trainedOn: today,
      password: PASSWORD,
    }).expect(400);
    const mine = (rows: { procedureId: string; personName: string; status: string }[]) =>
      rows
        .filter((r) => r.procedureId === procId)
        .map((r) => [r.personName, r.status])
        .sort();
    let rows = (await get(shop.s.operator, '/safety/training').expect(200)).body;
    expect(mine(rows)).toEqual([
      [`operator of ${shop.slug}`, 'current'],
      [`technician of ${shop.slug}`, 'current'],
    ]);
    // An editorial change without retraining keeps everyone current …
    await put(shop.s.technician, `/safety/procedures/${procId}/draft`, { ...cellProcedure('Trained procedure'), scope: 'Typo fixed.' }).expect(200);
    await post(shop.s.safety, `/safety/procedures/${procId}/versions/2/approve`, { password: PASSWORD, retrainingRequired: false }).expect(201);
    rows = (await get(shop.s.operator, '/safety/training').expect(200)).body;
    expect(mine(rows).map((r) => r[1])).toEqual(['current', 'current']);
    // … a real change sends everyone back to training.
    await put(shop.s.technician, `/safety/procedures/${procId}/draft`, { ...cellProcedure('Trained procedure'), release: ['New release step'] }).expect(200);
    await post(shop.s.safety, `/safety/procedures/${procId}/versions/3/approve`, { password: PASSWORD }).expect(201);
    rows = (await get(shop.s.operator, '/safety/training').expect(200)).body;
    expect(mine(rows).map((r) => r[1])).toEqual(['retrain', 'retrain']);
    await post(shop.s.safety, '/safety/training', {
      userId: shop.users.technician.userId,
      procedureId: procId,
      kind: 'authorized',
      trainedOn: today,
      password: PASSWORD,
    }).expect(201);
    rows = (await get(shop.s.operator, '/safety/training').expect(200)).body;
    expect(mine(rows)).toEqual([
      [`operator of ${shop.slug}`, 'retrain'],
      [`technician of ${shop.slug}`, 'current'],
    ]);
  });
});

describe('fire watch', () => {
  it('runs for the rule the site chose and cannot be ended early or by someone else', async () => {
    const start = await post(shop.s.operator, '/safety/fire-watches', { machineId: shop.machineId, password: PASSWORD }).expect(201);
    // OSHA 29 CFR 1910.252(a)(2)(iii)(B): at least 30 minutes after cutting.
    expect(new Date(start.body.until).getTime() - new Date(start.body.cuttingEndedAt).getTime()).toBe(30 * 60_000);
    expect(start.body.ruleSource).toBe('OSHA 29 CFR 1910.252(a)(2)(iii)(B)');
    const early = await post(shop.s.operator, `/safety/fire-watches/${start.body.id}/end`, { noFireFound: true, password: PASSWORD }).expect(409);
    expect(early.body.message).toMatch(/^Keep watching: the fire watch runs until .* \(OSHA 29 CFR 1910\.252\(a\)\(2\)\(iii\)\(B\)\), 30 min to go$/);
    await post(shop.s.technician, `/safety/fire-watches/${start.body.id}/end`, { noFireFound: true, password: PASSWORD }).expect(403);

    // NFPA 51B (2019) 5.6.1.1: one hour.
    const settings = (await get(shop.s.safety, '/safety/settings').expect(200)).body;
    const { defaults: _d, ...current } = settings;
    await put(shop.s.admin, '/safety/settings', { ...current, fireWatchRule: 'nfpa-51b-2019' }).expect(200);
    const endedAt = new Date(Date.now() - 61 * 60_000).toISOString();
    const nfpa = await post(shop.s.operator, '/safety/fire-watches', { machineId: shop.machineId, cuttingEndedAt: endedAt, password: PASSWORD }).expect(201);
    expect(new Date(nfpa.body.until).getTime() - new Date(endedAt).getTime()).toBe(60 * 60_000);
    expect(nfpa.body.followUp).toMatch(/up to 3 hours/);
    const noConfirm = await post(shop.s.operator, `/safety/fire-watches/${nfpa.body.id}/end`, { noFireFound: false, password: PASSWORD }).expect(400);
    expect(noConfirm.body.fields[0].path).toBe('noFireFound');
    await post(shop.s.operator, `/safety/fire-watches/${nfpa.body.id}/end`, { noFireFound: true, password: PASSWORD }).expect(201);
    await put(shop.s.admin, '/safety/settings', current).expect(200);
    const future = await post(shop.s.operator, '/safety/fire-watches', {
      machineId: shop.machineId,
      cuttingEndedAt: new Date(Date.now() + 3600_000).toISOString(),
      password: PASSWORD,
    }).expect(400);
    expect(future.body.fields[0].path).toBe('cuttingEndedAt');
    const list = (await get(shop.s.operator, '/safety/fire-watches').expect(200)).body;
    expect(list[0].endedAt).toBeNull(); // open watches first
  });
});

describe('superuser check', () => {
  it('can reach the database as the superuser for tamper tests', async () => {
    const su = await superuser();
    const r = await su.query('select rolsuper from pg_roles where rolname = current_user');
    await su.end();
    expect(r.rows[0].rolsuper).toBe(true);
  });
});
