import type { EntityManager } from '@mikro-orm/postgresql';
import { evaluatePlan } from '../../../shared/domain/due';
import { uuidArray } from '../../db';
import { inputsOf, loadMeterSeries, loadOilSeries, missingBaselines, oilMeterId, toPlanInput, type EnginePlanRow } from './plan-inputs';
import { evaluationHash, pendingRaise, statusColumns } from './plan-status';
import { humanReason, type MeterLabel } from './plan-reason';
import type { IMaintenancePlan, MeterBaselines } from './plan.entity';
import { clock } from '../../../shared/clock';
import { shopLocale } from '../../../shared/locale';

/**
 * Evaluates the given plans of one shop at once and raises what is due, as the scheduled pass
 * would (so an occurrence is still raised once). The pass lives above the modules (server/jobs);
 * start-up hands this to a module whose change makes plans due (an oil result outside targets).
 */
export type EvaluatePlansNow = (orgId: string, planIds: string[]) => Promise<void>;

/**
 * Evaluates one plan inside a request (after it was created, edited or completed) so its status and
 * next due point show at once. Raising work stays with the scheduled pass; this only stores status.
 */
export async function refreshPlanStatus(em: EntityManager, plan: IMaintenancePlan, timeZone: string, now = clock.now()): Promise<void> {
  const row: EnginePlanRow = {
    id: plan.id,
    organization_id: plan.organization.id,
    machine_id: plan.machine.id,
    triggers: plan.triggers,
    due_soon_days: plan.dueSoonDays ?? null,
    due_soon_fraction: plan.dueSoonFraction ?? null,
    started_at: plan.startedAt,
    last_done_at: plan.lastDoneAt ?? null,
    last_raised_key: plan.lastRaisedKey ?? null,
    meter_baselines: plan.meterBaselines,
    status: plan.status,
    recheck_at: null,
    inputs_at: null,
    status_hash: null,
  };
  const ins = inputsOf(row);
  const series = await loadMeterSeries(em, ins.meters, now);
  for (const [k, v] of await loadOilSeries(em, ins.oil, now)) series.set(k, v);
  const added = missingBaselines(row, series);
  if (added) {
    plan.meterBaselines = { ...plan.meterBaselines, ...added };
    row.meter_baselines = plan.meterBaselines;
  }
  const ev = evaluatePlan(toPlanInput(row, now, timeZone, series));
  const labels = new Map<string, MeterLabel>();
  if (ins.meters.length) {
    const rows: { id: string; name: string; unit: string }[] = await em.execute(`select id, name, unit from meter where id = any(?::uuid[])`, [
      uuidArray(ins.meters),
    ]);
    for (const r of rows) labels.set(r.id, { name: r.name, unit: r.unit });
  }
  const c = statusColumns(ev, (s) => humanReason(s, (id) => labels.get(id), { timeZone, locale: shopLocale() }));
  let inputsAt: number | null = null;
  for (const id of [...ins.meters, ...ins.oil.map(oilMeterId)]) {
    const t = series.get(id)?.readings.at(-1)?.at.getTime();
    if (t !== undefined && (inputsAt === null || t > inputsAt)) inputsAt = t;
  }
  plan.status = c.status;
  plan.nextDueAt = c.nextDueAt;
  plan.statusReason = c.statusReason;
  plan.evaluation = c.evaluation;
  plan.statusHash = evaluationHash(
    ev,
    timeZone,
    ins.meters.map((id) => labels.get(id)?.name ?? ''),
  );
  // A due occurrence is raised by the next pass: keep the plan in that pass's list.
  plan.recheckAt = pendingRaise(ev) ? null : c.recheckAt;
  plan.inputsAt = inputsAt === null ? null : new Date(inputsAt);
  plan.evaluatedAt = now;
}

/** Latest value of each meter, as the baseline a meter interval counts from (absent when never read: the first reading becomes it). */
export async function currentBaselines(em: EntityManager, meterIds: string[]): Promise<MeterBaselines> {
  const out: MeterBaselines = {};
  if (meterIds.length === 0) return out;
  const rows: { meter_id: string; value: number; read_at: Date }[] = await em.execute(
    `select m.id as meter_id, r.value, r.read_at from unnest(?::uuid[]) as m(id)
       cross join lateral (select value, read_at from meter_reading x where x.meter_id = m.id order by read_at desc, created_at desc limit 1) r`,
    [uuidArray(meterIds)],
  );
  for (const r of rows) out[r.meter_id] = { value: Number(r.value), at: new Date(r.read_at).toISOString() };
  return out;
}
