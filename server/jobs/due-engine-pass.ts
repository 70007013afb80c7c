/** The scheduled step around the due engine: the pass itself, the daily summaries, and one job run record per shop. */
import { randomUUID } from 'node:crypto';
import type { MikroORM } from '@mikro-orm/postgresql';
import { manualPass } from '../modules/job-runs/job-run-context';
import { clock } from '../../shared/clock';
import { runDueEngine } from './due-engine';
import { sendDigests } from './due-engine-digest';
import { emptyStats, errorText, type OrgStats } from './due-engine-run';
import type { JobStep, PassScope } from './scheduler';

const DAY_MS = 86_400_000;
/** Job run rows are kept this long. */
const RUN_HISTORY_DAYS = 30;

/** Writes one job run row per shop for a pass. */
async function recordRuns(orm: MikroORM, passId: string, startedAt: Date, stats: Map<string, OrgStats>) {
  const manual = manualPass.getStore();
  const finishedAt = clock.now();
  const rows = [...stats].map(([orgId, s]) => ({
    id: randomUUID(),
    organization_id: orgId,
    pass_id: passId,
    trigger: manual && manual.orgId === orgId ? 'manual' : 'schedule',
    triggered_by_id: manual && manual.orgId === orgId ? manual.userId : null,
    plans_checked: s.plansChecked,
    plans_evaluated: s.plansEvaluated,
    work_orders_raised: s.workOrdersRaised,
    escalations: s.escalations,
    mails_queued: s.mailsQueued,
    errors: s.errors,
  }));
  if (rows.length === 0) return;
  await orm.em.fork().execute(
    `insert into job_run (id, created_at, updated_at, organization_id, pass_id, trigger, triggered_by_id, started_at, finished_at,
            plans_checked, plans_evaluated, work_orders_raised, escalations, mails_queued, errors)
     select x.id, now(), now(), x.organization_id, x.pass_id, x.trigger, x.triggered_by_id, ?, ?, x.plans_checked, x.plans_evaluated,
            x.work_orders_raised, x.escalations, x.mails_queued, x.errors
       from jsonb_to_recordset(?::jsonb) as x(id uuid, organization_id uuid, pass_id uuid, trigger text, triggered_by_id uuid, plans_checked int,
            plans_evaluated int, work_orders_raised int, escalations int, mails_queued int, errors jsonb)`,
    [startedAt, finishedAt, JSON.stringify(rows)],
  );
  await orm.em.fork().execute(`delete from job_run where started_at < ?`, [new Date(startedAt.getTime() - RUN_HISTORY_DAYS * DAY_MS)]);
}

/** The scheduled step: evaluate every plan, raise, escalate, send daily summaries, record the run. */
export async function runMaintenancePass(orm: MikroORM, now: Date, config: { appUrl: string }, scope: PassScope = {}): Promise<Record<string, number>> {
  const passId = randomUUID();
  const startedAt = clock.now();
  let stats = new Map<string, OrgStats>();
  let failure: unknown = null;
  try {
    stats = await runDueEngine(orm, now, { appUrl: config.appUrl, orgId: scope.orgId });
    const digests = await sendDigests(orm, now, config.appUrl, scope.orgId);
    for (const [org, n] of digests) {
      const s = stats.get(org);
      if (s) s.mailsQueued += n;
    }
  } catch (err) {
    failure = err;
    const orgs: { id: string }[] = await orm.em
      .fork()
      .execute(`select id from organization ${scope.orgId ? 'where id = ?' : ''}`, scope.orgId ? [scope.orgId] : []);
    for (const o of orgs) {
      const s = stats.get(o.id) ?? emptyStats();
      s.errors.push({ message: `pass failed: ${errorText(err)}` });
      stats.set(o.id, s);
    }
  }
  await recordRuns(orm, passId, startedAt, stats);
  if (failure) throw failure;
  const total = emptyStats();
  for (const s of stats.values()) {
    total.plansChecked += s.plansChecked;
    total.plansEvaluated += s.plansEvaluated;
    total.workOrdersRaised += s.workOrdersRaised;
    total.escalations += s.escalations;
    total.mailsQueued += s.mailsQueued;
    total.errors.push(...s.errors);
  }
  return {
    plansChecked: total.plansChecked,
    plansEvaluated: total.plansEvaluated,
    workOrdersRaised: total.workOrdersRaised,
    escalations: total.escalations,
    mailsQueued: total.mailsQueued,
    errors: total.errors.length,
  };
}

/** The due engine's scheduler step, with the settings it mails links with. */
export const maintenancePassStep = (config: { appUrl: string }): JobStep => ({
  name: 'due-engine',
  run: (orm, now, scope) => runMaintenancePass(orm, now, config, scope),
});
