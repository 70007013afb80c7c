import type { EntityManager } from '@mikro-orm/postgresql';
import { LockMode } from '@mikro-orm/core';
import { Meter, MeterReading, type IMeter } from './meter.entity';
import { checkCounterAdvances } from '../safety/lockout-alarms';
import { Machine } from '../machines/machine.entity';
import type { Principal } from '../../http/principal';
import { AppError, badRequest, conflict, fieldError, notFound } from '../../http/errors';
import { recordActivity } from '../activity-log/activity-log.service';
import { completeByStationRecord } from '../work-orders/station-completion';
import { readingOrderProblem, readingValue, thinSeries } from '../../../shared/domain/meters';
import { formatDateTime } from '../../../shared/locale';
import { convertUnit } from '../../../shared/domain/units';
import { FORECAST_WINDOW_DAYS, windowedUsageRate } from '../../../shared/domain/forecast';
import { loadMeterSeries } from '../plans/plan-inputs';
import type {
  LatestReading,
  ListReadingsQuery,
  MeterInput,
  MeterRow,
  MeterTrend,
  MeterUpdate,
  ReadingBatchInput,
  ReadingBatchResult,
  ReadingInput,
  ReadingRow,
} from '../../../shared/schemas/machines';
import { clock } from '../../../shared/clock';
import type { Page } from '../../../shared/schemas/paging';

// ── Service functions other modules call (the due engine, consumables) ─────────

/**
 * The latest reading of each meter (by reading time; on a tie the later-recorded row).
 * Plain SQL for speed, so the shop filter does not apply here: pass ids of meters you
 * loaded through a shop-scoped query (or, in the scheduled job, across shops on purpose).
 */
export async function latestReadings(em: EntityManager, meterIds: string[]): Promise<Map<string, LatestReading>> {
  const out = new Map<string, LatestReading>();
  if (meterIds.length === 0) return out;
  const rows: { meter_id: string; value: number; read_at: Date; is_reset: boolean }[] = await em.execute(
    `select distinct on (meter_id) meter_id, value, read_at, is_reset
       from meter_reading where meter_id = any(?::uuid[])
      order by meter_id, read_at desc, created_at desc`,
    [`{${meterIds.join(',')}}`],
  );
  for (const r of rows) out.set(r.meter_id, { value: Number(r.value), readAt: new Date(r.read_at).toISOString(), isReset: r.is_reset });
  return out;
}

/** Readings of one meter taken at or after `since`, oldest first (plain SQL: see latestReadings). */
export async function readingsSince(em: EntityManager, meterId: string, since: Date): Promise<{ at: Date; value: number; isReset: boolean }[]> {
  const rows: { value: number; read_at: Date; is_reset: boolean }[] = await em.execute(
    'select value, read_at, is_reset from meter_reading where meter_id = ? and read_at >= ? order by read_at, created_at',
    [meterId, since],
  );
  return rows.map((r) => ({ at: new Date(r.read_at), value: Number(r.value), isReset: r.is_reset }));
}

/** The reading just before (or at) and just after a moment, for order checks. */
export async function neighbours(em: EntityManager, meterId: string, at: Date) {
  const [prev] = await em.find(MeterReading, { meter: meterId, readAt: { $lte: at } }, { orderBy: { readAt: 'desc', createdAt: 'desc' }, limit: 1 });
  const [next] = await em.find(MeterReading, { meter: meterId, readAt: { $gt: at } }, { orderBy: { readAt: 'asc', createdAt: 'asc' }, limit: 1 });
  const t = (r?: { readAt: Date; value: number; isReset: boolean }) => (r ? { at: r.readAt, value: r.value, isReset: r.isReset } : null);
  return { prev: t(prev), next: t(next) };
}

// ── Meters ──────────────────────────────────────────────────────────────────

export function meterRow(m: IMeter, machineCode: string, latest: LatestReading | null): MeterRow {
  return {
    id: m.id,
    machineId: m.machine.id,
    machineCode,
    code: m.code,
    name: m.name,
    kind: m.kind,
    unit: m.unit,
    lowerLimit: m.lowerLimit ?? null,
    upperLimit: m.upperLimit ?? null,
    latest,
  };
}

export async function getMeter(em: EntityManager, id: string): Promise<MeterRow> {
  const m = await em.findOne(Meter, { id }, { populate: ['machine'] });
  if (!m) throw notFound('Meter');
  const latest = await latestReadings(em, [m.id]);
  return meterRow(m, m.machine.getEntity().code, latest.get(m.id) ?? null);
}

export async function createMeter(em: EntityManager, who: Principal, input: MeterInput): Promise<{ id: string }> {
  return em.transactional(async (tx) => {
    const machine = await tx.findOne(Machine, { id: input.machineId });
    if (!machine) throw fieldError('machineId', 'The machine was not found');
    const clash = await tx.findOne(Meter, { machine: machine.id, code: input.code });
    if (clash)
      throw conflict(`${machine.code} already has a meter with the code ${input.code}`, [
        { path: 'code', message: `Code ${input.code} is taken on ${machine.code}` },
      ]);
    const m = tx.create(Meter, {
      organization: who.orgId,
      machine,
      code: input.code,
      name: input.name,
      kind: input.kind,
      unit: input.unit,
      lowerLimit: input.lowerLimit,
      upperLimit: input.upperLimit,
    });
    recordActivity(tx, who, 'meter.created', { type: 'Meter', id: m.id }, { machine: machine.code, code: input.code, unit: input.unit });
    return { id: m.id };
  });
}

export async function updateMeter(em: EntityManager, who: Principal, id: string, input: MeterUpdate): Promise<void> {
  await em.transactional(async (tx) => {
    const m = await tx.findOne(Meter, { id });
    if (!m) throw notFound('Meter');
    if (m.kind !== 'condition' && (input.lowerLimit != null || input.upperLimit != null))
      throw fieldError('upperLimit', 'Only condition meters have alarm limits');
    const lower = input.lowerLimit !== undefined ? input.lowerLimit : (m.lowerLimit ?? null);
    const upper = input.upperLimit !== undefined ? input.upperLimit : (m.upperLimit ?? null);
    if (lower !== null && upper !== null && lower >= upper) throw fieldError('upperLimit', 'The upper limit must be above the lower limit');
    if (input.name !== undefined) m.name = input.name;
    m.lowerLimit = lower;
    m.upperLimit = upper;
    recordActivity(tx, who, 'meter.updated', { type: 'Meter', id }, { ...input });
  });
}

// ── Readings ────────────────────────────────────────────────────────────────

/**
 * Records a typed-in (or consumable-change) reading. Counts and running time may not go
 * below the reading before them, nor above the one after them, unless marked as a reset.
 * The meter row is locked so two readings entered at once are checked one after the other.
 */
export async function recordReading(
  em: EntityManager,
  who: Pick<Principal, 'orgId' | 'userId' | 'timeZone' | 'locale'>,
  meterId: string,
  input: ReadingInput,
  source: 'manual' | 'consumable-change' | 'work-order' = 'manual',
) {
  const meter = await em.findOne(Meter, { id: meterId }, { lockMode: LockMode.PESSIMISTIC_WRITE });
  if (!meter) throw notFound('Meter');
  const at = input.readAt ? new Date(input.readAt) : clock.now();
  // A value read in another unit of the same quantity is stored in the meter's own unit.
  if (input.unit && input.unit !== meter.unit) {
    try {
      input = { ...input, value: convertUnit(input.value, input.unit, meter.unit) };
    } catch (err) {
      throw fieldError('unit', `${meter.name} counts in ${meter.unit}: ${err instanceof Error ? err.message : String(err)}`);
    }
  }
  const candidate = { at, value: input.value, isReset: input.isReset };
  const { prev, next } = await neighbours(em, meter.id, at);
  const before = readingOrderProblem(meter.kind, prev, candidate, meter.unit, who);
  if (before) throw fieldError('value', `${meter.name}: ${before}`);
  if (next && readingOrderProblem(meter.kind, candidate, next, meter.unit, who)) {
    throw fieldError(
      'value',
      `${meter.name}: ${readingValue(input.value, who.locale)} ${meter.unit} is higher than a later reading (${readingValue(next.value, who.locale)} ${meter.unit} on ${formatDateTime(next.at, who)})`,
    );
  }
  const reading = em.create(MeterReading, {
    organization: who.orgId,
    meter,
    value: input.value,
    readAt: at,
    source,
    isReset: input.isReset,
    note: input.note ?? null,
    recordedBy: who.userId,
  });
  return reading;
}

/** A reading typed in by a person may be the record a plan waits for ("read the counter weekly"). */
async function readingDoesWork(tx: EntityManager, who: Principal, r: { id: string; readAt: Date; value: number; meter: IMeter }) {
  await completeByStationRecord(tx, who, {
    type: 'MeterReading',
    id: r.id,
    machineId: r.meter.machine.id,
    meterId: r.meter.id,
    at: r.readAt,
    summary: `Reading of ${r.meter.name}: ${readingValue(r.value, who.locale)} ${r.meter.unit}`,
  });
}

export async function addReading(em: EntityManager, who: Principal, meterId: string, input: ReadingInput): Promise<{ id: string }> {
  return em.transactional(async (tx) => {
    const r = await recordReading(tx, who, meterId, input);
    await readingDoesWork(tx, who, { id: r.id, readAt: r.readAt, value: r.value, meter: r.meter.getEntity() });
    await tx.flush();
    await checkCounterAdvances(tx, who.orgId, [meterId]);
    recordActivity(
      tx,
      who,
      'meter.reading-recorded',
      { type: 'Meter', id: meterId },
      { value: input.value, isReset: input.isReset, readAt: r.readAt.toISOString() },
    );
    return { id: r.id };
  });
}

/**
 * Records several readings taken at one moment in one transaction. A refused one refuses all, on its
 * own field; with keepValid the others are kept and the refused ones come back with their reasons
 * (a reading is checked before anything of it is written, so a refused one leaves nothing behind).
 */
export async function addReadings(em: EntityManager, who: Principal, input: ReadingBatchInput): Promise<ReadingBatchResult> {
  return em.transactional(async (tx) => {
    const out: ReadingBatchResult = { ids: [], kept: [], refused: [] };
    const made: { id: string; readAt: Date; value: number; meter: IMeter }[] = [];
    for (const [i, r] of input.readings.entries()) {
      try {
        const reading = await recordReading(tx, who, r.meterId, { value: r.value, readAt: input.readAt, isReset: r.isReset, note: null });
        out.ids.push(reading.id);
        out.kept.push(r.meterId);
        made.push({ id: reading.id, readAt: reading.readAt, value: reading.value, meter: reading.meter.getEntity() });
      } catch (err) {
        if (err instanceof AppError && err.status === 404) throw fieldError(`readings.${i}.meterId`, 'Meter not found');
        if (err instanceof AppError && err.fields?.[0]?.path === 'value') {
          if (!input.keepValid) throw fieldError(`readings.${i}.value`, err.message);
          out.refused.push({ path: `readings.${i}.value`, meterId: r.meterId, message: err.message });
          continue;
        }
        throw err;
      }
    }
    if (out.ids.length === 0)
      throw badRequest(
        `No reading kept: ${out.refused.map((f) => f.message).join('; ')}`,
        out.refused.map(({ path, message }) => ({ path, message })),
      );
    for (const m of made) await readingDoesWork(tx, who, m);
    await tx.flush();
    await checkCounterAdvances(
      tx,
      who.orgId,
      input.readings.map((r) => r.meterId),
    );
    recordActivity(tx, who, 'meter.readings-recorded', { type: 'Meter' }, { count: out.ids.length, refused: out.refused.length });
    return out;
  });
}

export async function listReadings(em: EntityManager, meterId: string, q: ListReadingsQuery): Promise<Page<ReadingRow>> {
  const meter = await em.findOne(Meter, { id: meterId });
  if (!meter) throw notFound('Meter');
  const [rows, total] = await em.findAndCount(
    MeterReading,
    { meter: meterId },
    { orderBy: { readAt: q.dir, createdAt: q.dir }, limit: q.pageSize, offset: (q.page - 1) * q.pageSize, populate: ['recordedBy'] },
  );
  return {
    rows: rows.map((r) => ({
      id: r.id,
      value: r.value,
      readAt: r.readAt.toISOString(),
      isReset: r.isReset,
      source: r.source,
      note: r.note ?? null,
      recordedBy: r.recordedBy?.getEntity().name ?? null,
    })),
    total,
    page: q.page,
    pageSize: q.pageSize,
  };
}

/** Readings of the last `days` days for a chart (thinned to 400 points) and the usage rate. */
export async function meterTrend(em: EntityManager, meterId: string, days: number): Promise<MeterTrend> {
  const meter = await getMeter(em, meterId);
  const since = new Date(clock.ms() - days * 86_400_000);
  const all = await readingsSince(em, meterId, since);
  // The rate is the due engine's: the same time window (loadMeterSeries, forecastWindow), fitted after the last reset only.
  const series = (await loadMeterSeries(em, [meterId], clock.now())).get(meterId);
  const rate = meter.kind === 'condition' || !series ? null : windowedUsageRate(series.readings);
  return {
    meter,
    points: thinSeries(all, 400).map((r) => ({ at: r.at.toISOString(), value: r.value, isReset: r.isReset })),
    ratePerDay: rate?.ratePerDay ?? null,
    rate: rate
      ? { spanDays: Math.round(rate.spanDays * 10) / 10, readings: rate.readings, provisional: rate.provisional, windowDays: FORECAST_WINDOW_DAYS }
      : null,
  };
}
