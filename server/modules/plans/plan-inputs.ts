/**
 * Reads what the due engine needs (plans, recent meter readings, oil results) in bulk and turns one
 * plan row into the pure input of shared/domain/due.ts evaluatePlan. System code: it crosses shops
 * on purpose and every query says which rows it reads.
 */
import type { EntityManager } from '@mikro-orm/postgresql';
import type { PlanInput, Reading, Trigger } from '../../../shared/domain/due';
import type { StoredTrigger } from '../../../shared/schemas/plans';
import type { MeterBaselines } from './plan.entity';
import { uuidArray } from '../../db';

import { FORECAST_WINDOW_DAYS, MIN_FORECAST_SPAN_DAYS } from '../../../shared/domain/forecast';

/** Oil results kept per machine for the "outside targets" run (the newest ones). */
export const RECENT_OIL_RESULTS = 24;

export type EnginePlanRow = {
  id: string;
  organization_id: string;
  machine_id: string;
  triggers: StoredTrigger[];
  due_soon_days: number | null;
  due_soon_fraction: number | null;
  started_at: Date;
  last_done_at: Date | null;
  last_raised_key: string | null;
  meter_baselines: MeterBaselines;
  status: string;
  recheck_at: Date | null;
  inputs_at: Date | null;
  /** Digest of the stored status (plan-status.ts evaluationHash); null before the first evaluation. */
  status_hash: string | null;
};

/** The columns the pass reads for every active plan. */
export const PLAN_COLUMNS = `id, organization_id, machine_id, triggers, due_soon_days, due_soon_fraction, started_at, last_done_at,
  last_raised_key, meter_baselines, status, recheck_at, inputs_at, status_hash`;

export type MeterSeries = {
  /** Readings since the latest reset, oldest first. */
  readings: Reading[];
  /** Latest reset among the fetched readings, with the value just before it when known. */
  reset: { at: Date; value: number; before: number | null } | null;
};

/** Synthetic meter id for "oil analysis outside targets" of a machine (1 = outside, 0 = within). */
export const oilMeterId = (machineId: string) => `oil:${machineId}`;

/** Meter ids and oil machines a plan's triggers read. */
export function inputsOf(row: Pick<EnginePlanRow, 'triggers' | 'machine_id'>): { meters: string[]; oil: string[] } {
  const meters = new Set<string>();
  const oil = new Set<string>();
  for (const t of row.triggers) {
    if (t.kind === 'meter' || t.kind === 'condition') meters.add(t.meterId);
    if (t.kind === 'oil-analysis') oil.add(row.machine_id);
  }
  return { meters: [...meters], oil: [...oil] };
}

/**
 * Newest reading time of every meter and newest sample of every machine with oil results (all shops),
 * as of `now`: readings dated later (a clock set wrong, a replayed history) are not seen yet.
 */
export async function loadLatestInputTimes(em: EntityManager, now: Date): Promise<Map<string, number>> {
  const out = new Map<string, number>();
  const meters: { id: string; at: Date }[] = await em.execute(
    `select m.id, r.read_at as at from meter m
       cross join lateral (select read_at from meter_reading r where r.meter_id = m.id and r.read_at <= ? order by read_at desc limit 1) r`,
    [now],
  );
  for (const m of meters) out.set(m.id, new Date(m.at).getTime());
  const oil: { machine_id: string; at: Date }[] = await em.execute(
    `select machine_id, max(sampled_at) as at from oil_analysis where sampled_at <= ? group by machine_id`,
    [now],
  );
  for (const o of oil) out.set(oilMeterId(o.machine_id), new Date(o.at).getTime());
  return out;
}

/** Newest input time a plan depends on, or null when it reads no meter. */
export function inputsAtOf(row: Pick<EnginePlanRow, 'triggers' | 'machine_id'>, latest: Map<string, number>): number | null {
  const { meters, oil } = inputsOf(row);
  let best: number | null = null;
  for (const id of [...meters, ...oil.map(oilMeterId)]) {
    const t = latest.get(id);
    if (t !== undefined && (best === null || t > best)) best = t;
  }
  return best;
}

/** Must this plan be evaluated in this pass? New plan, a time boundary passed, or a newer reading. */
export function needsEvaluation(row: EnginePlanRow, nowMs: number, latest: Map<string, number>): boolean {
  if (row.recheck_at === null || new Date(row.recheck_at).getTime() <= nowMs) return true;
  const newest = inputsAtOf(row, latest);
  if (newest === null) return false;
  return row.inputs_at === null || newest > new Date(row.inputs_at).getTime();
}

/**
 * Recent readings (as of `now`) of the given meters, split at the latest reset: every reading of the
 * FORECAST_WINDOW_DAYS before each meter's latest one, whatever their count, plus the newest reading
 * at least MIN_FORECAST_SPAN_DAYS before it (the same window as shared/domain/forecast.ts forecastWindow).
 */
export async function loadMeterSeries(em: EntityManager, meterIds: string[], now: Date): Promise<Map<string, MeterSeries>> {
  const out = new Map<string, MeterSeries>();
  if (meterIds.length === 0) return out;
  const rows: { meter_id: string; value: number; read_at: Date; is_reset: boolean }[] = await em.execute(
    `select m.id as meter_id, x.value, x.read_at, x.is_reset
       from unnest(?::uuid[]) as m(id)
       cross join lateral (select max(read_at) as latest from meter_reading r where r.meter_id = m.id and r.read_at <= ?) l
       cross join lateral (
         select id, value, read_at, is_reset, created_at from meter_reading r
          where r.meter_id = m.id and r.read_at <= l.latest and r.read_at >= l.latest - interval '${FORECAST_WINDOW_DAYS * 24} hours'
         union
         (select id, value, read_at, is_reset, created_at from meter_reading r
           where r.meter_id = m.id and r.read_at <= l.latest - interval '${MIN_FORECAST_SPAN_DAYS * 24} hours'
           order by read_at desc, created_at desc limit 1)
       ) x
      order by m.id, x.read_at desc, x.created_at desc`,
    [uuidArray(meterIds), now],
  );
  const grouped = new Map<string, { value: number; at: Date; isReset: boolean }[]>();
  for (const r of rows) {
    let list = grouped.get(r.meter_id);
    if (!list) grouped.set(r.meter_id, (list = []));
    list.push({ value: Number(r.value), at: new Date(r.read_at), isReset: r.is_reset });
  }
  for (const id of meterIds) {
    const desc = grouped.get(id) ?? [];
    const asc = desc.reverse();
    let resetIdx = -1;
    for (let i = asc.length - 1; i >= 0; i--) {
      if (asc[i].isReset) {
        resetIdx = i;
        break;
      }
    }
    const reset = resetIdx >= 0 ? { at: asc[resetIdx].at, value: asc[resetIdx].value, before: resetIdx > 0 ? asc[resetIdx - 1].value : null } : null;
    out.set(id, { readings: asc.slice(Math.max(0, resetIdx)).map((r) => ({ at: r.at, value: r.value })), reset });
  }
  return out;
}

/** Recent oil results (as of `now`) of machines as 0/1 series (1 = outside the unit's targets). */
export async function loadOilSeries(em: EntityManager, machineIds: string[], now: Date): Promise<Map<string, MeterSeries>> {
  const out = new Map<string, MeterSeries>();
  if (machineIds.length === 0) return out;
  const rows: { machine_id: string; sampled_at: Date; out_of_limits: boolean }[] = await em.execute(
    `select m.id as machine_id, x.sampled_at, x.out_of_limits
       from unnest(?::uuid[]) as m(id)
       cross join lateral (select sampled_at, out_of_limits from oil_analysis o where o.machine_id = m.id and o.sampled_at <= ?
                           order by sampled_at desc limit ${RECENT_OIL_RESULTS}) x`,
    [uuidArray(machineIds), now],
  );
  for (const id of machineIds) out.set(oilMeterId(id), { readings: [], reset: null });
  for (const r of rows) out.get(oilMeterId(r.machine_id))!.readings.push({ at: new Date(r.sampled_at), value: r.out_of_limits ? 1 : 0 });
  for (const s of out.values()) s.readings.sort((a, b) => a.at.getTime() - b.at.getTime());
  return out;
}

/**
 * Baseline to count a meter interval from. A counter restarted since the baseline was taken is
 * followed across the reset (reset value − units used before it); a counter that reads
 * below its baseline with the reset out of sight is counted from zero.
 */
export function effectiveBaseline(stored: { value: number; at: string } | undefined, series: MeterSeries | undefined): number {
  if (!stored) return 0;
  const latest = series?.readings.at(-1)?.value;
  const reset = series?.reset;
  if (reset && reset.at.getTime() > Date.parse(stored.at)) {
    // Units used before the restart still count: shift the baseline below the reset value by that much.
    const usedBefore = reset.before !== null ? Math.max(0, reset.before - stored.value) : 0;
    return reset.value - usedBefore;
  }
  if (latest !== undefined && latest < stored.value) return 0;
  return stored.value;
}

/**
 * Meter intervals on a meter that had no reading when the plan started count from its first
 * reading: returns those new baselines (or null), to be stored with the plan.
 */
export function missingBaselines(
  row: Pick<EnginePlanRow, 'triggers' | 'meter_baselines' | 'started_at'>,
  series: Map<string, MeterSeries>,
): MeterBaselines | null {
  let out: MeterBaselines | null = null;
  for (const t of row.triggers) {
    if (t.kind !== 'meter' || row.meter_baselines?.[t.meterId]) continue;
    const readings = series.get(t.meterId)?.readings ?? [];
    if (readings.length === 0) continue;
    const start = new Date(row.started_at).getTime();
    const first = readings.find((r) => r.at.getTime() >= start) ?? readings[readings.length - 1];
    out ??= {};
    out[t.meterId] = { value: first.value, at: first.at.toISOString() };
  }
  return out;
}

/** One plan row plus its series → the pure evaluatePlan input. */
export function toPlanInput(row: EnginePlanRow, now: Date, timeZone: string, series: Map<string, MeterSeries>): PlanInput {
  const triggers: Trigger[] = row.triggers.map((t): Trigger => {
    switch (t.kind) {
      case 'calendar-fixed':
        return { kind: 'calendar-fixed', ical: t.ical };
      case 'calendar-floating':
        return { kind: 'calendar-floating', every: t.every, unit: t.unit, tz: timeZone };
      case 'meter':
        return { kind: 'meter', meterId: t.meterId, every: t.every };
      case 'condition':
        return { kind: 'condition', meterId: t.meterId, above: t.above, below: t.below };
      case 'oil-analysis':
        return { kind: 'condition', meterId: oilMeterId(row.machine_id), above: 0.5 };
    }
  });
  const meters: PlanInput['meters'] = {};
  for (const t of triggers) {
    if (t.kind !== 'meter' && t.kind !== 'condition') continue;
    const s = series.get(t.meterId);
    const readings = s?.readings ?? [];
    meters[t.meterId] = {
      baseline: t.kind === 'meter' ? effectiveBaseline(row.meter_baselines?.[t.meterId], s) : 0,
      latest: readings.at(-1) ?? null,
      recent: readings,
    };
  }
  return {
    now,
    startedAt: new Date(row.started_at),
    lastDoneAt: row.last_done_at ? new Date(row.last_done_at) : null,
    lastRaisedKey: row.last_raised_key,
    triggers,
    meters,
    dueSoon: {
      ...(row.due_soon_days !== null ? { days: Number(row.due_soon_days) } : {}),
      ...(row.due_soon_fraction !== null ? { fraction: Number(row.due_soon_fraction) } : {}),
    },
  };
}
