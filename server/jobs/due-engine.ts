/**
 * The due engine's pass. The decision is shared/domain/due.ts evaluatePlan (pure); this reads the
 * plans and readings in bulk (plans/plan-inputs.ts), writes each plan's status
 * (due-engine-statuses.ts), raises one work order per due occurrence (due-engine-raise.ts), tells
 * of it and escalates past-due work (due-engine-escalation.ts). It is system code that crosses
 * shops on purpose (raw SQL names the rows it touches; each write carries the plan's own
 * organisation). Settings (the link base of its mails) are passed in, not read here.
 */
import type { EntityManager, MikroORM } from '@mikro-orm/postgresql';
import { evaluatePlan } from '../../shared/domain/due';
import { uuidArray } from '../db';
import {
  PLAN_COLUMNS,
  inputsAtOf,
  inputsOf,
  loadLatestInputTimes,
  missingBaselines,
  loadMeterSeries,
  loadOilSeries,
  needsEvaluation,
  oilMeterId,
  toPlanInput,
  type EnginePlanRow,
  type MeterSeries,
} from '../modules/plans/plan-inputs';
import { evaluationHash, pendingRaise } from '../modules/plans/plan-status';
import { humanReason, type MeterLabel } from '../modules/plans/plan-reason';
import type { EvaluatePlansNow } from '../modules/plans/plan-evaluation';
import { clock } from '../../shared/clock';
import { shopLocale } from '../../shared/locale';
import { logger } from '../logger';
import { Run, errorText, type Evaluated, type Org, type OrgStats } from './due-engine-run';
import { writeStatuses } from './due-engine-statuses';
import { notifyRaised, raiseWork } from './due-engine-raise';
import { escalate } from './due-engine-escalation';

export type { OrgStats } from './due-engine-run';

/** Plans read per query. */
const PLAN_BATCH = 2000;

export type EngineOptions = {
  /** Base of the links in the mails it queues (config APP_URL). */
  appUrl: string;
  /** Only this shop's plans (e.g. right after an oil result); default every shop. */
  orgId?: string;
  /** Only these plans, evaluated whatever their recheck time. */
  planIds?: string[];
  /** Escalate past-due work (full passes). Default true. */
  escalate?: boolean;
  /** Mail notices for raised work. Default true; the demo seed's history replay turns it off. */
  notify?: boolean;
};

/** At most one write in flight; its failure is rethrown by the next `wait`. */
class WriteQueue {
  private inFlight: Promise<void> | null = null;
  private failure: { error: unknown } | null = null;
  start(work: () => Promise<void>) {
    this.inFlight = work().catch((error: unknown) => {
      this.failure = { error };
    });
  }
  async wait() {
    if (this.inFlight) await this.inFlight;
    this.inFlight = null;
    const failed = this.failure;
    this.failure = null;
    if (failed) throw failed.error;
  }
}

/**
 * Evaluates plans and raises what is due. Full pass by default; with `planIds` only those plans
 * (used right after a completion or an oil result). Returns per-shop counts.
 */
export async function runDueEngine(orm: MikroORM, now: Date, opts: EngineOptions): Promise<Map<string, OrgStats>> {
  const em = orm.em.fork();
  const orgRows: Org[] = await em.execute(`select id, name, time_zone from organization ${opts.orgId ? 'where id = ?' : ''}`, opts.orgId ? [opts.orgId] : []);
  const run = new Run(new Map(orgRows.map((o) => [o.id, o])), opts.appUrl, opts.notify !== false);
  for (const o of orgRows) run.of(o.id);

  const writes = new WriteQueue();
  try {
    await evaluateAll(orm, em, run, now, opts, writes);
  } finally {
    // Whatever stopped the loop, the batch still being written finishes (and reports) before the pass ends.
    await writes.wait().catch((err: unknown) => {
      logger.error({ err }, 'writing plan statuses failed');
      for (const org of run.orgs.keys()) run.error(org, `writing plan statuses failed: ${errorText(err)}`);
    });
  }
  if (run.notify) await notifyRaised(orm, run, now);
  if (opts.escalate !== false) await escalate(orm, run, now, opts.orgId);
  return run.stats;
}

/** Reads the plans in batches, evaluates each and hands the writes of each batch to `writes`. */
async function evaluateAll(orm: MikroORM, em: EntityManager, run: Run, now: Date, opts: EngineOptions, writes: WriteQueue) {
  const nowMs = now.getTime();
  const latest = await loadLatestInputTimes(em, now);
  const series = new Map<string, MeterSeries>();
  const labels = new Map<string, MeterLabel>();
  let lastId = '00000000-0000-0000-0000-000000000000';
  for (;;) {
    const params: unknown[] = [lastId];
    let where = 'active and id > ?';
    if (opts.orgId) {
      where += ' and organization_id = ?';
      params.push(opts.orgId);
    }
    if (opts.planIds) {
      where += ' and id = any(?::uuid[])';
      params.push(uuidArray(opts.planIds));
    }
    const rows: EnginePlanRow[] = await em.execute(`select ${PLAN_COLUMNS} from maintenance_plan where ${where} order by id limit ${PLAN_BATCH}`, params);
    if (rows.length === 0) break;
    lastId = rows[rows.length - 1].id;
    for (const r of rows) run.of(r.organization_id).plansChecked++;
    const todo = opts.planIds ? rows : rows.filter((r) => needsEvaluation(r, nowMs, latest));
    if (todo.length > 0) {
      const needMeters = new Set<string>();
      const needOil = new Set<string>();
      for (const r of todo) {
        const ins = inputsOf(r);
        for (const m of ins.meters) if (!series.has(m)) needMeters.add(m);
        for (const o of ins.oil) if (!series.has(oilMeterId(o))) needOil.add(o);
      }
      for (const [k, v] of await loadMeterSeries(em, [...needMeters], now)) series.set(k, v);
      for (const [k, v] of await loadOilSeries(em, [...needOil], now)) series.set(k, v);
      const unlabelled = [...new Set(todo.flatMap((r) => inputsOf(r).meters))].filter((m) => !labels.has(m));
      if (unlabelled.length) {
        const rows: { id: string; name: string; unit: string }[] = await em.execute(`select id, name, unit from meter where id = any(?::uuid[])`, [
          uuidArray(unlabelled),
        ]);
        for (const r of rows) labels.set(r.id, { name: r.name, unit: r.unit });
      }

      const evaluated: Evaluated[] = [];
      for (const row of todo) {
        const org = run.orgs.get(row.organization_id);
        if (!org) continue;
        run.of(row.organization_id).plansEvaluated++;
        try {
          const newBaselines = missingBaselines(row, series);
          if (newBaselines) row.meter_baselines = { ...row.meter_baselines, ...newBaselines };
          const ev = evaluatePlan(toPlanInput(row, now, org.time_zone, series));
          const names = inputsOf(row).meters.map((id) => labels.get(id)?.name ?? '');
          evaluated.push({
            row,
            ev,
            hash: evaluationHash(ev, org.time_zone, names),
            inputsAt: inputsAtOf(row, latest),
            newBaselines,
            human: (s) => humanReason(s, (id) => labels.get(id), { timeZone: org.time_zone, locale: shopLocale() }),
          });
        } catch (err) {
          run.error(row.organization_id, errorText(err), row.id);
        }
      }
      // Writing one batch overlaps with reading and evaluating the next (PostgreSQL works while this
      // process computes); writes stay in order, one batch at a time.
      await writes.wait();
      writes.start(async () => {
        await writeStatuses(em.fork(), evaluated, now);
        const toRaise = new Map<string, Evaluated[]>();
        for (const e of evaluated) {
          if (!pendingRaise(e.ev)) continue;
          let l = toRaise.get(e.row.organization_id);
          if (!l) toRaise.set(e.row.organization_id, (l = []));
          l.push(e);
        }
        for (const [org, list] of toRaise) await raiseWork(orm, run, org, list, now);
      });
    }
    if (rows.length < PLAN_BATCH) break;
  }
  await writes.wait();
}

/** The due engine as a module may call it: these plans of one shop, now, without escalating. */
export function planEvaluator(orm: MikroORM, appUrl: string): EvaluatePlansNow {
  return async (orgId, planIds) => {
    await runDueEngine(orm, clock.now(), { appUrl, orgId, planIds, escalate: false });
  };
}
