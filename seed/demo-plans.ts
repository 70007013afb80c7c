/**
 * Demo maintenance for the invented shop: starter plans applied to the demo machines (found by
 * code), a year of work history replayed through the real due engine week by week (work raised,
 * then signed off a day or two later), oil results for the hydraulic unit, and — by leaving the
 * last weeks partly undone — some work that is due or past due today. Skips quietly when the
 * machines step has not created the machines.
 */
import type { EntityManager } from '@mikro-orm/postgresql';
import type { SeedStep } from './demo';
import { initORM } from '../server/db';
import { Machine } from '../server/modules/machines/machine.entity';
import { Organization } from '../server/modules/organizations/organization.entity';
import { Membership } from '../server/modules/users/user.entity';
import { OilAnalysis, OilTarget } from '../server/modules/oil-analysis/oil-analysis.entity';
import { applyStarters } from '../server/modules/plans/plan-starters';
import { judge } from '../server/modules/oil-analysis/oil-analysis.service';
import { runDueEngine } from '../server/jobs/due-engine';
import { uuidArray } from '../server/db';
import type { Principal } from '../server/http/principal';
import type { ChecklistLine } from '../shared/schemas/work-orders';
import { mulberry32 } from './prng';
import { clock } from '../shared/clock';
import { shopLocale } from '../shared/locale';

const DAY = 86_400_000;

/** Which starters go on which demo machine. */
const STARTERS: Record<string, string[]> = {
  H1: ['hyd-oil-change', 'hyd-filters', 'oil-sample', 'oil-off-target', 'oil-too-hot'],
  F1: ['extractor-cartridges', 'extractor-bin'],
  C1: ['electrode-nozzle', 'axis-lube', 'clamps', 'tool-lube', 'punch-sharpen', 'cut-coupon', 'torch-lead'],
  C2: ['electrode-nozzle', 'axis-lube', 'clamps', 'tool-lube', 'punch-sharpen', 'torch-lead'],
  P1: ['electrode-nozzle', 'axis-lube', 'cut-coupon', 'torch-lead'],
  B1: ['brake-guarding'],
};

const prng = mulberry32;

/** A plausible answer for each checklist line: OK, with measured values inside their limits. */
function answered(lines: ChecklistLine[], r: () => number): ChecklistLine[] {
  return lines.map((l) => {
    if (l.kind !== 'measure') return { ...l, result: 'pass', value: null, note: null };
    const lo = l.min ?? 0;
    const hi = l.max ?? lo + 10;
    return { ...l, result: 'pass', value: Math.round((lo + (hi - lo) * (0.3 + 0.4 * r())) * 100) / 100, note: null };
  });
}

export const seedPlansDemo: SeedStep = async (rootEm, shop, settings) => {
  if (!settings) throw new Error('The plans demo queues mails: pass the app URL (DemoSettings)');
  const { appUrl } = settings;
  const em = rootEm.fork() as EntityManager;
  em.setFilterParams('org', { orgId: shop.id });
  const machines = await em.find(Machine, { code: { $in: Object.keys(STARTERS) } });
  if (machines.length === 0) return; // no demo machines: nothing to plan
  const people = await em.find(Membership, { organization: shop.id }, { filters: false, populate: ['user'] });
  const orgName = (await em.findOneOrFail(Organization, shop.id, { filters: false })).name;
  const admin = people.find((m) => m.role === 'admin');
  const tech = people.find((m) => m.role === 'technician') ?? admin;
  if (!admin || !tech) return;
  const who: Principal = {
    userId: admin.user.id,
    orgId: shop.id,
    role: 'admin',
    name: admin.user.getEntity().name,
    email: admin.user.getEntity().email,
    orgName,
    timeZone: shop.timeZone,
    locale: shopLocale(),
  };

  const now = clock.ms();
  const start = now - 364 * DAY;
  const startDate = new Date(start).toISOString().slice(0, 10);
  for (const m of machines) await applyStarters(em, who, { machineId: m.id, starterKeys: STARTERS[m.code] }, { startDate });

  const orm = await initORM();
  const conn = orm.em.fork();
  // The plans count from a year ago, as if the shop had kept them all along.
  await conn.execute(
    `update maintenance_plan set started_at = ?, last_done_at = null, last_raised_key = null, meter_baselines = '{}', recheck_at = null where organization_id = ?`,
    [new Date(start), shop.id],
  );

  // Oil: targets and a quarterly result; the summer sample is dirty and raises condition work.
  const h1 = machines.find((m) => m.code === 'H1');
  const oilSamples: { at: number; counts: [number, number, number]; v: number; w: number; t: number }[] = [
    { at: start + 20 * DAY, counts: [900, 260, 28], v: 46.8, w: 140, t: 44 },
    { at: start + 110 * DAY, counts: [1150, 300, 36], v: 46.1, w: 180, t: 47 },
    { at: start + 200 * DAY, counts: [3400, 980, 120], v: 44.9, w: 620, t: 52 },
    { at: start + 290 * DAY, counts: [1000, 290, 31], v: 45.6, w: 210, t: 46 },
  ];
  const r = prng(4406);
  for (let day = start + 7 * DAY; day <= now - 7 * DAY; day += 7 * DAY) {
    if (h1) {
      for (const s of oilSamples.filter((o) => o.at <= day && o.at > day - 7 * DAY)) {
        const target = await em.findOne(OilTarget, { machine: h1.id });
        const t = target
          ? {
              targetCode: target.targetCode,
              vgGrade: target.vgGrade,
              baselineViscosityCst: target.baselineViscosityCst ?? null,
              waterLimitPpm: target.waterLimitPpm,
              temperatureLimitC: target.temperatureLimitC ?? null,
            }
          : // The oil as delivered measured 45.8 mm²/s; used oil is judged against that.
            { targetCode: '17/15/12', vgGrade: 46, baselineViscosityCst: 45.8, waterLimitPpm: 500, temperatureLimitC: null };
        if (!target) em.create(OilTarget, { organization: shop.id, machine: h1, ...t });
        const input = { ge4um: s.counts[0], ge6um: s.counts[1], ge14um: s.counts[2], viscosity40: s.v, waterPpm: s.w, temperatureC: s.t };
        const v = judge(input, t);
        em.create(OilAnalysis, {
          organization: shop.id,
          machine: h1,
          sampledAt: new Date(s.at),
          labReference: `L-${24000 + (Math.round(s.at / DAY) % 1000)}`,
          ...input,
          isoCode: v.isoCode,
          targetCode: t.targetCode,
          vgGrade: t.vgGrade,
          viscosityBand: v.viscosityBand,
          outOfLimits: v.outOfLimits,
          findings: v.findings,
          recordedBy: tech.user.id,
        });
        await em.flush();
      }
    }
    const mark = clock.now();
    await runDueEngine(orm, new Date(day), { appUrl, orgId: shop.id, escalate: false, notify: false });
    // Work raised in this replayed week carries that week's date, not the seeding clock's.
    await conn.execute(`update work_order set created_at = ?, updated_at = ? where organization_id = ? and created_at >= ?`, [
      new Date(day),
      new Date(day),
      shop.id,
      mark,
    ]);
    await conn.execute(`update audit_event set created_at = ?, updated_at = ? where organization_id = ? and entity_type = 'WorkOrder' and created_at >= ?`, [
      new Date(day),
      new Date(day),
      shop.id,
      mark,
    ]);
    // Sign off what was raised, a day or two later. The last two weeks are left partly open, and
    // safety-critical work raised in them always: whatever day the demo is seeded, a safety check waits.
    const open: {
      id: string;
      plan_id: string;
      created_at: Date;
      estimated_minutes: number | null;
      checklist: ChecklistLine[];
      requires_lockout: boolean;
      safety_critical: boolean;
    }[] = await conn.execute(
      `select id, plan_id, created_at, estimated_minutes, checklist, requires_lockout, safety_critical from work_order
        where organization_id = ? and status = 'open' and plan_id is not null`,
      [shop.id],
    );
    for (const w of open) {
      const doneAt = day + (0.2 + r() * 2) * DAY;
      if (doneAt > now - 14 * DAY && (r() < 0.4 || w.safety_critical)) continue;
      if (doneAt > now) continue;
      const minutes = Math.max(5, Math.round((w.estimated_minutes ?? 30) * (0.7 + r() * 0.7)));
      await conn.execute(
        `update work_order set status = 'done', started_at = ?, completed_at = ?, completed_by_id = ?, labour_minutes = ?, checklist = ?::jsonb,
                lockout_released_at = case when requires_lockout then ?::timestamptz else null end, updated_at = ? where id = ?`,
        [
          new Date(doneAt - minutes * 60_000),
          new Date(doneAt),
          tech.user.id,
          minutes,
          JSON.stringify(answered(w.checklist, r)),
          new Date(doneAt - 60_000),
          new Date(doneAt),
          w.id,
        ],
      );
      await conn.execute(
        `insert into audit_event (id, created_at, updated_at, organization_id, actor_id, action, entity_type, entity_id, details)
         values (gen_random_uuid(), ?, ?, ?, ?, 'work-order.closed', 'WorkOrder', ?, ?::jsonb)`,
        [new Date(doneAt), new Date(doneAt), shop.id, tech.user.id, w.id, JSON.stringify({ labourMinutes: minutes, failed: [] })],
      );
      // The plan's cycle restarts at the sign-off: meter baselines from the readings at that time.
      const [plan]: { triggers: { kind: string; meterId?: string }[] }[] = await conn.execute(`select triggers from maintenance_plan where id = ?`, [
        w.plan_id,
      ]);
      const meterIds = plan.triggers.filter((t) => t.kind === 'meter' && t.meterId).map((t) => t.meterId as string);
      const baselines: Record<string, { value: number; at: string }> = {};
      if (meterIds.length) {
        const rows: { meter_id: string; value: number; read_at: Date }[] = await conn.execute(
          `select m.id as meter_id, x.value, x.read_at from unnest(?::uuid[]) as m(id)
             cross join lateral (select value, read_at from meter_reading r where r.meter_id = m.id and r.read_at <= ? order by read_at desc limit 1) x`,
          [uuidArray(meterIds), new Date(doneAt)],
        );
        for (const b of rows) baselines[b.meter_id] = { value: Number(b.value), at: new Date(b.read_at).toISOString() };
      }
      await conn.execute(
        `update maintenance_plan set last_done_at = ?, meter_baselines = meter_baselines || ?::jsonb, recheck_at = null, updated_at = ? where id = ? and (last_done_at is null or last_done_at < ?)`,
        [new Date(doneAt), JSON.stringify(baselines), new Date(doneAt), w.plan_id, new Date(doneAt)],
      );
    }
  }
  // Each dirty oil sample points at the condition work it raised (the first raised after it).
  await conn.execute(
    `update oil_analysis a set work_order_id = (
        select w.id from work_order w join maintenance_plan p on p.id = w.plan_id
         where w.organization_id = a.organization_id and p.machine_id = a.machine_id and w.kind = 'condition' and w.created_at >= a.sampled_at
         order by w.created_at limit 1)
      where a.organization_id = ? and a.out_of_limits and a.work_order_id is null`,
    [shop.id],
  );
  // Today: the real pass raises what is due now and reports what is past due.
  await conn.execute(`update maintenance_plan set recheck_at = null where organization_id = ?`, [shop.id]);
  await runDueEngine(orm, clock.now(), { appUrl, orgId: shop.id });
};
