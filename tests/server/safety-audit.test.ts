import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { writeFileSync } from 'node:fs';
import Papa from 'papaparse';
import { makeTestApp } from '../setup/test-app';
import { readPdf } from '../setup/pdf';
import {
  appRole,
  approvedProcedure,
  cellProcedure,
  get,
  lockPoints,
  makeSafetyShop,
  PASSWORD,
  post,
  shopToday,
  superuser,
  type SafetyShop,
} from './safety-helpers';
import { runScheduledPass } from '../../server/jobs/scheduler';
import { initORM } from '../../server/db';
import { WORK_CAUTION } from '../../shared/domain/cautions';
import type { SignedIn } from '../setup/test-app';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let shop: SafetyShop;
let other: SafetyShop;
let procId: string;
let reqId: string;

const binary = (who: SignedIn, url: string) =>
  who.agent
    .get(`/api${url}`)
    .buffer(true)
    .parse((r, cb) => {
      const chunks: Buffer[] = [];
      r.on('data', (c: Buffer) => chunks.push(c));
      r.on('end', () => cb(null, Buffer.concat(chunks)));
    });

beforeAll(async () => {
  t = await makeTestApp();
  shop = await makeSafetyShop(t.app, t.em(), 'audit');
  other = await makeSafetyShop(t.app, t.em(), 'audit-other');
  // Only the technician locks out here, so only the technician is trained (signature #2).
  procId = await approvedProcedure(shop, cellProcedure(), shop.machineId, ['technician']);
  const req = await post(shop.s.safety, '/safety/ppe/requirements', {
    machineId: shop.machineId,
    task: 'Plasma cutting',
    items: ['safety-glasses'],
    otherItems: [],
    arcCurrentA: 200,
    noise: [],
    cadence: 'shift',
  }).expect(201);
  reqId = req.body.id;
  const lo = await post(shop.s.technician, '/safety/lockouts', {
    procedureId: procId,
    reason: 'Swap torch lead',
    points: lockPoints('A'),
    password: PASSWORD,
  }).expect(201);
  const d = await get(shop.s.technician, `/safety/lockouts/${lo.body.id}`).expect(200);
  await post(shop.s.technician, `/safety/lockouts/${lo.body.id}/verify`, {
    testedPointIds: d.body.points.map((p: { id: string }) => p.id),
    startAttempted: true,
    password: PASSWORD,
  }).expect(201);
  await post(shop.s.operator, '/safety/ppe/checks', { requirementId: reqId, confirmed: ['safety-glasses', 'filter-lens'], password: PASSWORD }).expect(201);
  await post(shop.s.technician, `/safety/lockouts/${lo.body.id}/release`, {
    areaChecked: true,
    peopleClear: true,
    affectedNotified: true,
    password: PASSWORD,
  }).expect(201);
  // One signature in the other shop, which must never show here.
  await approvedProcedure(other);
});
afterAll(() => t.close());

describe('the safety officer’s audit', () => {
  it('lists signatures with filters, sorting and server paging', async () => {
    const all = await get(shop.s.safety, '/safety/sign-offs?sort=seq&dir=asc').expect(200);
    expect(all.body.total).toBe(6);
    expect(all.body.rows.map((r: { meaning: string }) => r.meaning)).toEqual([
      'procedure-approved',
      'training-recorded',
      'lockout-applied',
      'isolation-verified',
      'ppe-check-done',
      'lockout-released',
    ]);
    expect(all.body.rows.map((r: { signerName: string }) => r.signerName)).not.toContain(`safety of ${other.slug}`);
    const page2 = await get(shop.s.admin, '/safety/sign-offs?sort=seq&dir=asc&pageSize=2&page=2').expect(200);
    expect(page2.body).toMatchObject({ total: 6, page: 2, pageSize: 2 });
    expect(page2.body.rows.map((r: { seq: number }) => r.seq)).toEqual([3, 4]);
    const tech = await get(shop.s.safety, `/safety/sign-offs?signerId=${shop.users.technician.userId}`).expect(200);
    expect(tech.body.total).toBe(3);
    const released = await get(shop.s.safety, '/safety/sign-offs?meaning=lockout-released').expect(200);
    expect(released.body.rows[0].summary).toMatch(/^C1: area checked, people clear, affected employees told; removed E1 lock A-01/);
    const byMachine = await get(shop.s.safety, `/safety/sign-offs?machineId=${shop.otherMachineId}`).expect(200);
    expect(byMachine.body.total).toBe(0);
    const today = shopToday();
    const ranged = await get(shop.s.safety, `/safety/sign-offs?from=2000-01-01&to=2000-12-31`).expect(200);
    expect(ranged.body.total).toBe(0);
    const bad = await get(shop.s.safety, '/safety/sign-offs?from=yesterday').expect(400);
    expect(bad.body.fields[0]).toEqual({ path: 'from', message: 'Use a date like 2026-03-01' });
    // A reversed range is an error on "To", not an empty list; the exports refuse it the same way.
    const reversed = await get(shop.s.safety, '/safety/sign-offs?from=2026-03-10&to=2026-03-01').expect(400);
    expect(reversed.body.fields).toEqual([{ path: 'to', message: '"To" must be on or after "From" (2026-03-10)' }]);
    await get(shop.s.safety, '/safety/audit/export.csv?from=2026-03-10&to=2026-03-01').expect(400);
    await get(shop.s.safety, '/safety/sign-offs?from=2026-03-01&to=2026-03-01').expect(200);
    await get(shop.s.technician, '/safety/sign-offs').expect(403);
    const bySigner = await get(shop.s.safety, `/safety/sign-offs?sort=signerName&dir=asc&from=${today.slice(0, 4)}-01-01`).expect(200);
    const names = bySigner.body.rows.map((r: { signerName: string }) => r.signerName);
    expect(names).toEqual([...names].sort());
  });

  it('exports CSV with printed name, time, meaning and the chain check', async () => {
    const res = await get(shop.s.safety, '/safety/audit/export.csv?sort=seq&dir=asc').expect(200);
    expect(res.headers['content-type']).toBe('text/csv; charset=utf-8');
    expect(res.headers['content-disposition']).toMatch(/^attachment; filename="safety-sign-offs-audit-/);
    const parsed = Papa.parse<Record<string, string>>(res.text.replace(/^\uFEFF/, ''), { header: true, skipEmptyLines: true });
    expect(parsed.data).toHaveLength(6);
    expect(parsed.data[2]).toMatchObject({
      seq: '3',
      printed_name: `technician of ${shop.slug}`,
      role: 'Maintenance technician',
      meaning: 'Locks applied',
      machine: 'C1',
      chain_check: 'verified',
      time_zone: 'America/Chicago',
    });
    expect(parsed.data[2].signed_at_utc).toMatch(/^\d{4}-\d\d-\d\dT\d\d:\d\d:\d\d\.\d{3}Z$/);
    expect(parsed.data[4].statement).toBe('I am wearing every item of PPE this task requires, in good condition.');
  });

  it('exports a PDF that names each signer and says the chain verified', async () => {
    const res = await binary(shop.s.admin, '/safety/audit/export.pdf');
    expect(res.status).toBe(200);
    const pdf = await readPdf(res.body as Buffer);
    const text = pdf.text.replace(/\s+/g, ' ');
    expect(text).toContain('CHAIN VERIFIED — all 6 signatures of the shop are intact and in order');
    for (const n of [`safety of ${shop.slug}`, `technician of ${shop.slug}`, `operator of ${shop.slug}`]) expect(text).toContain(n);
    expect(text).toContain('Zero energy verified');
    if (process.env.KEEP_PDF) writeFileSync(process.env.KEEP_PDF, res.body as Buffer);
    expect(pdf.firstPagePng.length).toBeGreaterThan(10_000); // a page with ink on it, not a blank sheet
  });

  it('says so in the export when the chain is broken', async () => {
    const broken = await makeSafetyShop(t.app, t.em(), 'audit-broken');
    await approvedProcedure(broken, cellProcedure(), broken.machineId, []);
    await approvedProcedure(broken, cellProcedure(), broken.machineId, []);
    const su = await superuser();
    await su.query('begin');
    await su.query('set local session_replication_role = replica');
    await su.query(`update safety_sign_off set statement = 'I approve nothing.' where organization_id = $1 and seq = 1`, [broken.orgId]);
    await su.query('commit');
    await su.end();
    const csv = await get(broken.s.safety, '/safety/audit/export.csv?sort=seq&dir=asc').expect(200);
    expect(csv.headers['x-chain-verified']).toBe('false');
    const rows = Papa.parse<Record<string, string>>(csv.text.replace(/^\uFEFF/, ''), { header: true, skipEmptyLines: true }).data;
    expect(rows.map((r) => r.chain_check)).toEqual(['ALTERED', 'not verifiable (after the break)']);
    const pdf = await binary(broken.s.safety, '/safety/audit/export.pdf');
    const text = (await readPdf(pdf.body as Buffer)).text.replace(/\s+/g, ' ');
    expect(text).toContain('CHAIN BROKEN — Chain broken: record #1');
  });

  it('summarises compliance per machine and over time', async () => {
    const c = await get(shop.s.safety, '/safety/audit/compliance?days=30').expect(200);
    const cell = c.body.machines.find((m: { machineCode: string }) => m.machineCode === 'C1');
    expect(cell).toMatchObject({ procedureVersion: 1, inspectionStatus: 'not-due', openLockouts: 0 });
    const table = c.body.machines.find((m: { machineCode: string }) => m.machineCode === 'PT1');
    expect(table).toMatchObject({ inspectionStatus: 'none', ppeExpected: 0 });
    const tl = await get(shop.s.safety, '/safety/audit/timeline?weeks=4').expect(200);
    expect(tl.body).toHaveLength(4);
    const last = tl.body.at(-1);
    expect(last.signOffs).toBe(6);
    expect(last.lockouts).toBe(1);
    expect(last.inspectionsCurrentPct).toBe(100);
    await get(shop.s.safety, '/safety/audit/timeline?weeks=1').expect(400);
  });

  it('raises overdue safety work once, mails the safety officer through the outbox, and closes it when done', async () => {
    const late = await makeSafetyShop(t.app, t.em(), 'audit-late');
    const lateProc = await approvedProcedure(late);
    const req = await post(late.s.safety, '/safety/ppe/requirements', {
      machineId: late.machineId,
      task: 'Punching',
      items: ['safety-glasses'],
      otherItems: [],
      arcCurrentA: null,
      noise: [],
      cadence: 'shift',
    }).expect(201);
    // Back-date the approval 13 months and the PPE requirement 5 days (these tables are not append-only).
    const c = await appRole();
    await c.query(`update safety_procedure_version set approved_at = now() - interval '13 months' where procedure_id = $1`, [lateProc]);
    await c.query(`update safety_ppe_requirement set created_at = now() - interval '5 days' where id = $1`, [req.body.id]);
    await c.end();

    const orm = await initORM();
    const result = await runScheduledPass(orm);
    expect(result?.['safety-due']).toBeDefined();
    expect((result?.['safety-due'] as { error?: string }).error).toBeUndefined();
    const tasks = (await get(late.s.safety, '/safety/tasks').expect(200)).body as { kind: string; status: string; title: string }[];
    expect(tasks.map((x) => [x.kind, x.status])).toEqual(
      expect.arrayContaining([
        ['periodic-inspection', 'overdue'],
        ['ppe-check', 'overdue'],
      ]),
    );
    expect(tasks.find((x) => x.kind === 'periodic-inspection')!.title).toMatch(/Periodic inspection of C1 .*\(OSHA 29 CFR 1910\.147\(c\)\(6\)\)/);

    const mails = async () => {
      const db = await appRole();
      const r = await db.query(
        `select to_address, subject, text_body from outbox_mail where organization_id = $1 and kind = 'safety-overdue' order by created_at`,
        [late.orgId],
      );
      await db.end();
      return r.rows as { to_address: string; subject: string; text_body: string }[];
    };
    let sent = await mails();
    expect(sent).toHaveLength(1);
    expect(sent[0].to_address).toBe(late.users.safety.email);
    expect(sent[0].subject).toMatch(/^Overdue safety work at Test audit-late-\w+: 2 items$/);
    expect(sent[0].text_body).toContain(`Safety: ${WORK_CAUTION}`);

    // The next pass raises nothing new and mails nothing again.
    await runScheduledPass(orm);
    sent = await mails();
    expect(sent).toHaveLength(1);
    expect(((await get(late.s.safety, '/safety/tasks').expect(200)).body as unknown[]).length).toBe(tasks.length);

    // The inspection done and certified, and a PPE check: the tasks close on the next pass.
    const today = shopToday();
    const ins = await post(late.s.safety, '/safety/inspections', {
      procedureId: lateProc,
      inspectedOn: today,
      employeeIds: [late.users.technician.userId],
      findings: 'All steps followed.',
      responsibilitiesReviewed: true,
      password: PASSWORD,
    }).expect(201);
    await post(late.s.safety, `/safety/inspections/${ins.body.id}/certify`, { password: PASSWORD }).expect(201);
    await post(late.s.operator, '/safety/ppe/checks', { requirementId: req.body.id, confirmed: ['safety-glasses'], password: PASSWORD }).expect(201);
    await runScheduledPass(orm);
    const after = (await get(late.s.safety, '/safety/tasks').expect(200)).body as { kind: string }[];
    expect(after.filter((x) => x.kind === 'periodic-inspection')).toEqual([]);
    expect(after.filter((x) => x.kind === 'ppe-check')).toEqual([]);
    const comp = await get(late.s.safety, '/safety/audit/compliance?days=7').expect(200);
    const cell = comp.body.machines.find((m: { machineCode: string }) => m.machineCode === 'C1');
    expect(cell.inspectionStatus).toBe('not-due');
    expect(cell.ppeMissed).toBeGreaterThan(0); // the shifts of the last days without a check
  });
});
