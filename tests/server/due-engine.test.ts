import { describe, it, expect, beforeAll, beforeEach, afterAll } from 'vitest';
import type { MikroORM } from '@mikro-orm/postgresql';
import { makeShop, makeTestApp, signIn, type SignedIn, type TestShop } from '../setup/test-app';
import { initORM } from '../../server/db';
import { runScheduledPass } from '../../server/jobs/scheduler';
import { runDueEngine } from '../../server/jobs/due-engine';
import { runMaintenancePass } from '../../server/jobs/due-engine-pass';
import { FakeSmtp } from '../../server/mail/fake-smtp';
import { createTransport } from '../../server/mail/transport';
import { deliverOutbox } from '../../server/mail/sender';
import { loadConfig } from '../../server/config';
import { clock } from '../../shared/clock';
import { WORK_CAUTION } from '../../shared/domain/cautions';
import { addReadings, drainOutbox, get, makeMachine, makeMeter, pendingMails, planBody, post, put, scoped } from './work-orders-fixtures';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let orm: MikroORM;
let shop: TestShop;
let admin: SignedIn;
let tech: SignedIn;
let unit: string;
let pumpHours: string;

type WoRow = { id: string; plan_id: string; occurrence_key: string; due_at: Date; status: string; overdue: boolean; escalated_at: Date | null; number: number };
const workOf = async (planId: string): Promise<WoRow[]> => orm.em.fork().execute(`select * from work_order where plan_id = ? order by created_at`, [planId]);

async function makePlan(body: Record<string, unknown>, startedAt?: string): Promise<string> {
  const res = await post(admin, '/plans', planBody(unit, body));
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  // Tests travel in time: the plan counts from this instant, as if created then.
  if (startedAt) await orm.em.fork().execute(`update maintenance_plan set started_at = ?, recheck_at = null where id = ?`, [new Date(startedAt), res.body.id]);
  return res.body.id;
}

/** Each test works in a shop of its own, so counts of work and mail are exact. */
async function freshShop() {
  shop = await makeShop(t.em(), 'due');
  admin = await signIn(t.app, shop.users.admin.email);
  tech = await signIn(t.app, shop.users.technician.email);
  const em = scoped(t.em(), shop.orgId);
  unit = await makeMachine(em, shop.orgId, 'HU1');
  pumpHours = await makeMeter(em, shop.orgId, unit, 'pump-hours');
  await addReadings(em, shop.orgId, pumpHours, [{ at: '2026-01-01T08:00:00Z', value: 1000 }]);
}

beforeAll(async () => {
  t = await makeTestApp();
  orm = await initORM();
});
beforeEach(freshShop);
afterAll(() => t.close());

describe('a plan falls due', () => {
  it('raises exactly one work order for the occurrence, with a cautioned notice to the technician', async () => {
    await drainOutbox(orm);
    const planId = await makePlan({ title: 'Renew return filter', triggers: [{ kind: 'meter', meterId: pumpHours, every: 500 }] }, '2026-01-01T00:00:00Z');
    // Baseline 1000 h (the reading when the plan was made); due at 1500 h.
    const plan = await get(admin, `/plans/${planId}`).expect(200);
    expect(plan.body.meterDue[0]).toMatchObject({ dueValue: 1500, current: 1000 });

    await addReadings(scoped(t.em(), shop.orgId), shop.orgId, pumpHours, [
      { at: '2026-01-11T08:00:00Z', value: 1300 },
      { at: '2026-01-21T08:00:00Z', value: 1600 },
    ]);
    const now = new Date('2026-01-21T09:00:00Z');
    await runDueEngine(orm, now, { appUrl: t.config.APP_URL, orgId: shop.orgId });
    await runDueEngine(orm, now, { appUrl: t.config.APP_URL, orgId: shop.orgId });
    await runScheduledPass(orm, now);

    const wos = await workOf(planId);
    expect(wos).toHaveLength(1);
    expect(wos[0].occurrence_key).toBe(`meter:${pumpHours}:1500`);
    // The work copies its plan: instructions, the checklist in order with empty results, the estimate.
    const copied = wos[0] as WoRow & { instructions: string; checklist: unknown[]; estimated_minutes: number; responsible_role: string; kind: string };
    expect(copied).toMatchObject({
      instructions: 'Isolate, replace, check the indicator.',
      estimated_minutes: 45,
      responsible_role: 'technician',
      kind: 'scheduled',
    });
    expect(copied.checklist).toEqual([
      { key: 'isolated', label: 'Unit isolated', kind: 'check', result: null, value: null, note: null },
      { key: 'dp', label: 'Filter pressure drop after start', kind: 'measure', unit: 'bar', min: 0, max: 1.5, result: null, value: null, note: null },
    ]);
    // Crossed 1500 h two thirds of the way from 11 Jan 08:00Z (1300 h) to 21 Jan 08:00Z (1600 h):
    // 11 Jan 08:00Z + 6 d 16 h = 18 Jan 00:00Z (linear between readings).
    expect(new Date(wos[0].due_at).toISOString()).toBe('2026-01-18T00:00:00.000Z');
    const mails = (await pendingMails(orm, shop.orgId)).filter((m) => m.kind === 'work-raised');
    expect(mails.map((m) => m.toAddress)).toEqual([shop.users.technician.email]);
    expect(mails[0].subject).toBe(`New work: WO ${wos[0].number} Renew return filter on HU1`);
    expect(mails[0].textBody).toContain(WORK_CAUTION);
    expect(mails[0].htmlBody).toContain('Safety:');

    const detail = await get(tech, `/plans/${planId}`).expect(200);
    expect(detail.body.status).toBe('overdue'); // 3.5 days past the crossing, grace max(2 d, 1 d)
    expect(detail.body.openWorkOrder.id).toBe(wos[0].id);
  });

  it('a plan that is due the moment it is written is raised by the next pass', async () => {
    const em = scoped(t.em(), shop.orgId);
    const dp = await makeMeter(em, shop.orgId, unit, 'filter-dp', 'condition', 'Pa');
    await addReadings(em, shop.orgId, dp, [
      { at: '2026-01-10T08:00:00Z', value: 900 },
      { at: '2026-01-11T08:00:00Z', value: 1650 },
    ]);
    // The condition is past due already; the calendar trigger alone would not be due for a month.
    const res = await post(
      admin,
      '/plans',
      planBody(unit, {
        title: 'Change cartridges',
        triggers: [
          { kind: 'condition', meterId: dp, above: 1500 },
          { kind: 'calendar-floating', every: 1, unit: 'month' },
        ],
      }),
    ).expect(201);
    expect((await get(admin, `/plans/${res.body.id}`).expect(200)).body.status).toBe('overdue');
    await runDueEngine(orm, new Date(), { appUrl: t.config.APP_URL, orgId: shop.orgId });
    const wos = await workOf(res.body.id);
    expect(wos.map((w) => w.occurrence_key)).toEqual([`cond:${dp}:2026-01-11T08:00:00.000Z`]);
  });

  it('three concurrent passes raise each work order once (lock), and so do three unlocked engines (unique key)', async () => {
    const ids: string[] = [];
    for (let i = 0; i < 6; i++)
      ids.push(await makePlan({ title: `Weekly check ${i}`, triggers: [{ kind: 'calendar-floating', every: 1, unit: 'week' }] }, '2026-02-01T06:00:00Z'));
    const now = new Date('2026-02-08T07:00:00Z');
    const results = await Promise.all([runScheduledPass(orm, now), runScheduledPass(orm, now), runScheduledPass(orm, now)]);
    expect(results.filter((r) => r !== null).length).toBeGreaterThanOrEqual(1);
    for (const id of ids.slice(0, 3)) expect(await workOf(id)).toHaveLength(1);

    // Without the advisory lock the row lock and the (plan, occurrence_key) constraint still hold.
    const more: string[] = [];
    for (let i = 0; i < 6; i++)
      more.push(await makePlan({ title: `Fortnightly check ${i}`, triggers: [{ kind: 'calendar-floating', every: 2, unit: 'week' }] }, '2026-02-01T06:00:00Z'));
    const later = new Date('2026-02-15T07:00:00Z');
    await Promise.all([
      runDueEngine(orm, later, { appUrl: t.config.APP_URL, orgId: shop.orgId }),
      runDueEngine(orm, later, { appUrl: t.config.APP_URL, orgId: shop.orgId }),
      runDueEngine(orm, later, { appUrl: t.config.APP_URL, orgId: shop.orgId }),
    ]);
    for (const id of [...ids, ...more]) expect(await workOf(id), id).toHaveLength(1);
  });

  it('keeps 07:00 local time across the daylight-saving change (America/Chicago, 8 March 2026)', async () => {
    // US DST starts the second Sunday of March (15 U.S.C. 260a): 8 March 2026. 07:00 CST = 13:00Z, 07:00 CDT = 12:00Z.
    const planId = await makePlan(
      { title: 'Inspect clamps', triggers: [{ kind: 'calendar-fixed', start: '2026-02-23T07:00', rrule: 'FREQ=WEEKLY;BYDAY=MO' }] },
      '2026-02-20T00:00:00Z',
    );
    const plan = await get(admin, `/plans/${planId}`).expect(200);
    expect(plan.body.triggers[0].ical).toBe('DTSTART;TZID=America/Chicago:20260223T070000\nRRULE:FREQ=WEEKLY;BYDAY=MO');

    await runDueEngine(orm, new Date('2026-03-02T13:00:00Z'), { appUrl: t.config.APP_URL, orgId: shop.orgId });
    let wos = await workOf(planId);
    expect(wos.map((w) => w.occurrence_key)).toEqual(['cal:2026-03-02T13:00:00.000Z']);
    // Done that morning (as if signed off then).
    await orm.em.fork().execute(`update work_order set status = 'done', completed_at = ? where id = ?`, [new Date('2026-03-02T15:00:00Z'), wos[0].id]);
    await orm.em.fork().execute(`update maintenance_plan set last_done_at = ?, recheck_at = null where id = ?`, [new Date('2026-03-02T15:00:00Z'), planId]);

    await runDueEngine(orm, new Date('2026-03-09T11:59:00Z'), { appUrl: t.config.APP_URL, orgId: shop.orgId });
    expect(await workOf(planId)).toHaveLength(1); // 06:59 CDT: not yet
    await runDueEngine(orm, new Date('2026-03-09T12:00:00Z'), { appUrl: t.config.APP_URL, orgId: shop.orgId });
    wos = await workOf(planId);
    expect(wos.map((w) => w.occurrence_key)).toEqual(['cal:2026-03-02T13:00:00.000Z', 'cal:2026-03-09T12:00:00.000Z']);
    expect(new Date(wos[1].due_at).toISOString()).toBe('2026-03-09T12:00:00.000Z');
  });

  it('after downtime raises one work order per plan (the latest missed occurrence), not one per missed week', async () => {
    await drainOutbox(orm);
    const ids: string[] = [];
    for (const day of ['MO', 'WE', 'FR']) {
      ids.push(
        await makePlan(
          { title: `Lubricate guides (${day})`, triggers: [{ kind: 'calendar-fixed', start: '2026-04-06T06:00', rrule: `FREQ=WEEKLY;BYDAY=${day}` }] },
          '2026-04-01T00:00:00Z',
        ),
      );
    }
    // Nobody ran a pass from 1 April to 20 May: seven weeks of missed occurrences.
    await runDueEngine(orm, new Date('2026-05-20T15:00:00Z'), { appUrl: t.config.APP_URL, orgId: shop.orgId });
    const keys = [];
    for (const id of ids) {
      const wos = await workOf(id);
      expect(wos).toHaveLength(1);
      keys.push(wos[0].occurrence_key);
      expect(wos[0].overdue).toBe(true);
    }
    // Latest missed before Wed 20 May 15:00Z: Mon 18 May, Wed 20 May (06:00 CDT = 11:00Z), Fri 15 May.
    expect(keys).toEqual(['cal:2026-05-18T11:00:00.000Z', 'cal:2026-05-20T11:00:00.000Z', 'cal:2026-05-15T11:00:00.000Z']);
    const mails = await pendingMails(orm, shop.orgId);
    // One notice listing the new work to the technician, one escalation to the admin.
    const raised = mails.filter((m) => m.kind === 'work-raised');
    expect(raised).toHaveLength(1);
    expect(raised[0].subject).toMatch(/^3 new work orders for you/);
    expect(mails.filter((m) => m.kind === 'work-escalated').map((m) => m.toAddress)).toEqual([shop.users.admin.email]);
  });

  it('escalates past-due safety work to the safety officer and tells the technician whatever their setting', async () => {
    await put(tech, '/notify-preference', { mode: 'none', digestHour: 6 }).expect(200);
    await drainOutbox(orm);
    const planId = await makePlan(
      { title: 'Inspect torch lead', safetyCritical: true, triggers: [{ kind: 'calendar-floating', every: 1, unit: 'week' }] },
      '2026-06-01T06:00:00Z',
    );
    await runDueEngine(orm, new Date('2026-06-08T07:00:00Z'), { appUrl: t.config.APP_URL, orgId: shop.orgId });
    expect((await pendingMails(orm, shop.orgId)).filter((m) => m.kind === 'work-raised')).toHaveLength(0); // "none": no routine notice
    await runDueEngine(orm, new Date('2026-06-11T07:00:00Z'), { appUrl: t.config.APP_URL, orgId: shop.orgId }); // 3 days past, grace 2 days
    const mails = await pendingMails(orm, shop.orgId);
    expect(
      mails
        .filter((m) => m.kind === 'work-escalated')
        .map((m) => m.toAddress)
        .sort(),
    ).toEqual([shop.users.admin.email, shop.users.safety.email].sort());
    const mandatory = mails.filter((m) => m.kind === 'work-overdue-safety');
    expect(mandatory.map((m) => m.toAddress)).toEqual([shop.users.technician.email]);
    expect(mandatory[0].textBody).toContain(WORK_CAUTION);
    // Escalated once only.
    await runDueEngine(orm, new Date('2026-06-12T07:00:00Z'), { appUrl: t.config.APP_URL, orgId: shop.orgId });
    expect((await pendingMails(orm, shop.orgId)).filter((m) => m.kind.startsWith('work-overdue') || m.kind === 'work-escalated')).toHaveLength(3);
    expect((await workOf(planId))[0].escalated_at).not.toBeNull();
    await put(tech, '/notify-preference', { mode: 'immediate', digestHour: 6 }).expect(200);
  });

  it('sends a daily summary once per local day after the chosen hour', async () => {
    await put(tech, '/notify-preference', { mode: 'daily', digestHour: 6 }).expect(200);
    await makePlan({ title: 'Top up tool oil', triggers: [{ kind: 'calendar-floating', every: 1, unit: 'week' }] }, '2026-06-01T06:00:00Z');
    await runDueEngine(orm, new Date('2026-06-08T07:00:00Z'), { appUrl: t.config.APP_URL, orgId: shop.orgId });
    // "daily": no notice for the new work, it waits for the summary.
    expect((await pendingMails(orm, shop.orgId)).filter((m) => m.kind === 'work-raised')).toHaveLength(0);
    await drainOutbox(orm);
    // 05:30 CDT: too early; 06:10 CDT: sent; 09:00 the same day: not again; next day: again.
    await runMaintenancePass(orm, new Date('2026-06-15T10:30:00Z'), { appUrl: t.config.APP_URL });
    expect((await pendingMails(orm, shop.orgId)).filter((m) => m.kind === 'work-digest')).toHaveLength(0);
    await runMaintenancePass(orm, new Date('2026-06-15T11:10:00Z'), { appUrl: t.config.APP_URL });
    await runMaintenancePass(orm, new Date('2026-06-15T14:00:00Z'), { appUrl: t.config.APP_URL });
    let digests = (await pendingMails(orm, shop.orgId)).filter((m) => m.kind === 'work-digest');
    expect(digests.map((m) => m.toAddress)).toEqual([shop.users.technician.email]);
    expect(digests[0].subject).toMatch(/^Your work for 15 Jun 2026: \d+ open/);
    expect(digests[0].textBody).toContain(WORK_CAUTION);
    await runMaintenancePass(orm, new Date('2026-06-16T12:00:00Z'), { appUrl: t.config.APP_URL });
    digests = (await pendingMails(orm, shop.orgId)).filter((m) => m.kind === 'work-digest');
    expect(digests).toHaveLength(2);
    await put(tech, '/notify-preference', { mode: 'immediate', digestHour: 6 }).expect(200);
  });

  it('records each pass for the admin, and the admin can run one now', async () => {
    await makePlan({ title: 'Check breather' });
    const before = await get(admin, '/job-runs').expect(200);
    const ran = await post(admin, '/job-runs').expect(200);
    expect(ran.body.ran).toBe(true);
    expect(ran.body.run).toMatchObject({ trigger: 'manual', triggeredBy: `admin of ${shop.slug}` });
    expect(ran.body.run.plansChecked).toBe(1);
    const after = await get(admin, '/job-runs').expect(200);
    expect(after.body.total).toBe(before.body.total + 1);
    expect(after.body.rows[0].finishedAt >= after.body.rows[0].startedAt).toBe(true);
    await post(tech, '/job-runs').expect(403);
  });

  it("an admin's run-now pass covers only the admin's shop: another shop's due work and run history stay untouched", async () => {
    const mine = await makePlan({ title: 'Check breather', triggers: [{ kind: 'meter', meterId: pumpHours, every: 100 }] }, '2026-01-01T00:00:00Z');
    await addReadings(scoped(t.em(), shop.orgId), shop.orgId, pumpHours, [{ at: clockedReadingAt(), value: 1200 }]);
    const myShop = { shop, admin, pumpHours };
    // A second shop with a plan that is just as due.
    await freshShop();
    const theirs = await makePlan({ title: 'Check breather', triggers: [{ kind: 'meter', meterId: pumpHours, every: 100 }] }, '2026-01-01T00:00:00Z');
    await addReadings(scoped(t.em(), shop.orgId), shop.orgId, pumpHours, [{ at: clockedReadingAt(), value: 1200 }]);
    const runsOf = async (orgId: string): Promise<{ pass_id: string }[]> =>
      orm.em.fork().execute(`select pass_id from job_run where organization_id = ?`, [orgId]);
    const theirRunsBefore = (await runsOf(shop.orgId)).length;

    const ran = await post(myShop.admin, '/job-runs').expect(200);
    expect(ran.body.run).toMatchObject({ trigger: 'manual', workOrdersRaised: 1 });
    expect(await workOf(mine)).toHaveLength(1);
    expect(await workOf(theirs)).toHaveLength(0);
    expect(await runsOf(shop.orgId)).toHaveLength(theirRunsBefore);
    // The pass of this run wrote a row for the caller's shop and for no other.
    const passRows: { organization_id: string }[] = await orm.em
      .fork()
      .execute(`select organization_id from job_run where pass_id = (select pass_id from job_run where id = ?)`, [ran.body.run.id]);
    expect(passRows.map((r) => r.organization_id)).toEqual([myShop.shop.orgId]);
  });
});

/** A reading an hour before now, so a pass run now sees it. */
const clockedReadingAt = () => new Date(clock.ms() - 3_600_000).toISOString();

describe('notices of raised work', () => {
  it('go out once per person per pass, after the raising, and a pass that stopped before telling anyone is caught up by the next', async () => {
    await drainOutbox(orm);
    const ids: string[] = [];
    for (const title of ['Renew return filter', 'Check pump coupling', 'Sample the oil']) {
      ids.push(await makePlan({ title, triggers: [{ kind: 'meter', meterId: pumpHours, every: 200 }] }, '2026-01-01T00:00:00Z'));
    }
    await addReadings(scoped(t.em(), shop.orgId), shop.orgId, pumpHours, [{ at: '2026-01-05T08:00:00Z', value: 1250 }]);
    await runDueEngine(orm, new Date('2026-01-05T09:00:00Z'), { appUrl: t.config.APP_URL, orgId: shop.orgId });
    const raised = (await pendingMails(orm, shop.orgId)).filter((m) => m.kind === 'work-raised');
    expect(raised.map((m) => m.subject)).toEqual([`3 new work orders for you at Test ${shop.slug}`]);
    await drainOutbox(orm);

    // As if the pass had stopped after raising this one: nobody was told.
    const [wo] = await workOf(ids[0]);
    await orm.em.fork().execute(`update work_order set notified_at = null where id = ?`, [wo.id]);
    await runDueEngine(orm, new Date('2026-01-05T09:05:00Z'), { appUrl: t.config.APP_URL, orgId: shop.orgId });
    const late = (await pendingMails(orm, shop.orgId)).filter((m) => m.kind === 'work-raised');
    expect(late.map((m) => m.subject)).toEqual([`New work: WO ${wo.number} Renew return filter on HU1`]);
    expect(late[0].toAddress).toBe(shop.users.technician.email);
    await runDueEngine(orm, new Date('2026-01-05T09:10:00Z'), { appUrl: t.config.APP_URL, orgId: shop.orgId });
    expect((await pendingMails(orm, shop.orgId)).filter((m) => m.kind === 'work-raised')).toHaveLength(1);
  });
});

describe('a pass that finds the same answer', () => {
  type PlanRow = {
    status: string;
    status_reason: string;
    status_hash: string | null;
    evaluated_at: string | null;
    updated_at: string;
    recheck_at: string | null;
  };
  const planRow = async (id: string): Promise<PlanRow> =>
    (
      await orm.em
        .fork()
        .execute<PlanRow[]>(`select status, status_reason, status_hash, evaluated_at, updated_at, recheck_at from maintenance_plan where id = ?`, [id])
    )[0];
  const forceRecheck = (id: string) => orm.em.fork().execute(`update maintenance_plan set recheck_at = null where id = ?`, [id]);

  it('leaves the stored status alone, but rewrites it when the answer or a meter name changes', async () => {
    const planId = await makePlan({ title: 'Renew return filter', triggers: [{ kind: 'meter', meterId: pumpHours, every: 500 }] }, '2026-01-01T00:00:00Z');
    await runDueEngine(orm, new Date('2026-01-02T09:00:00Z'), { appUrl: t.config.APP_URL, orgId: shop.orgId });
    const first = await planRow(planId);
    expect(first.status).toBe('not-due');
    expect(first.status_reason).toContain('pump hours reads 1000 of 1500');
    expect(first.status_hash).not.toBeNull();

    // Evaluated again with nothing new: the status is not rewritten, only the re-check time is put back.
    await forceRecheck(planId);
    await runDueEngine(orm, new Date('2026-01-02T09:05:00Z'), { appUrl: t.config.APP_URL, orgId: shop.orgId });
    const same = await planRow(planId);
    expect(new Date(same.updated_at).getTime()).toBe(new Date(first.updated_at).getTime());
    expect(new Date(same.evaluated_at!).toISOString()).toBe('2026-01-02T09:05:00.000Z');
    expect(same.status_hash).toBe(first.status_hash);
    expect(same.recheck_at).not.toBeNull();

    // Reasons carry the meter's name: renaming it changes what people read, so the row is rewritten.
    await orm.em.fork().execute(`update meter set name = 'Pump running hours' where id = ?`, [pumpHours]);
    await forceRecheck(planId);
    await runDueEngine(orm, new Date('2026-01-02T09:10:00Z'), { appUrl: t.config.APP_URL, orgId: shop.orgId });
    const renamed = await planRow(planId);
    expect(renamed.status_reason).toContain('Pump running hours reads 1000 of 1500');
    expect(renamed.status_hash).not.toBe(first.status_hash);
    expect(new Date(renamed.evaluated_at!).toISOString()).toBe('2026-01-02T09:10:00.000Z');

    // A new reading past the mark changes the answer.
    await addReadings(scoped(t.em(), shop.orgId), shop.orgId, pumpHours, [{ at: '2026-01-03T08:00:00Z', value: 1510 }]);
    await runDueEngine(orm, new Date('2026-01-03T09:00:00Z'), { appUrl: t.config.APP_URL, orgId: shop.orgId });
    const due = await planRow(planId);
    expect(due.status).toBe('due');
    expect(due.status_reason).toContain('Pump running hours reads 1510, due at 1500');
    expect(await workOf(planId)).toHaveLength(1);
  });
});

describe('mail while the mail server is down', () => {
  it('keeps every notice queued and delivers each exactly once when the server is back', async () => {
    const port = 26_000 + Math.floor(Math.random() * 1000);
    const config = loadConfig({ ...process.env, NODE_ENV: 'test', SMTP_PORT: String(port), MAIL_CAPTURE: 'true' });
    const transport = createTransport(config);
    const smtp = new FakeSmtp(port);
    await drainOutbox(orm);
    const ids: string[] = [];
    // Three roles responsible: three notices to three people.
    for (const role of ['technician', 'safety', 'admin']) {
      ids.push(
        await makePlan(
          { title: `Drain water trap (${role})`, responsibleRole: role, triggers: [{ kind: 'calendar-floating', every: 3, unit: 'day' }] },
          '2026-07-01T06:00:00Z',
        ),
      );
    }
    await runDueEngine(orm, new Date('2026-07-04T07:00:00Z'), { appUrl: t.config.APP_URL, orgId: shop.orgId });
    const queued = await pendingMails(orm, shop.orgId);
    expect(queued.map((m) => m.toAddress).sort()).toEqual([shop.users.admin.email, shop.users.safety.email, shop.users.technician.email].sort());

    // Server stopped: every attempt fails and the mails stay pending.
    const down = await deliverOutbox(orm, transport, config.MAIL_FROM);
    expect(down.sent).toBe(0);
    expect(down.failed).toBe(queued.length);

    await smtp.start();
    try {
      await orm.em.fork().execute(`update outbox_mail set next_attempt_at = now() where status = 'pending'`);
      const [a, b] = await Promise.all([deliverOutbox(orm, transport, config.MAIL_FROM), deliverOutbox(orm, transport, config.MAIL_FROM)]);
      expect(a.sent + b.sent).toBe(queued.length);
      expect(await deliverOutbox(orm, transport, config.MAIL_FROM)).toEqual({ sent: 0, failed: 0 });
      for (const m of queued) expect(smtp.mails.filter((c) => c.subject === m.subject && c.to.includes(m.toAddress))).toHaveLength(1);
      expect(smtp.mails.every((c) => c.text.includes('Safety:'))).toBe(true);
    } finally {
      await smtp.stop();
    }
  });
});
