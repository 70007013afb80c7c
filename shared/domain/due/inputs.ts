/** Checks of the due engine's input, and the shared helpers the trigger evaluations read it with. */
import { canonicalZone as canonicalZoneUncached } from '../recurrence';
import { windowedUsageRate } from '../forecast';
import { DAY_MS, type DueSoonWindow, type MeterInput, type PlanInput, type Reading } from './types';

// Zone names are few and their lookup (Intl) is slow; the answer for a name never changes.
const zoneNames = new Map<string, string>();
export function canonicalZone(tz: string): string {
  let z = zoneNames.get(tz);
  if (z === undefined) {
    z = canonicalZoneUncached(tz);
    if (zoneNames.size < 1000) zoneNames.set(tz, z);
  }
  return z;
}
function fail(message: string): never {
  throw new Error(`evaluatePlan: ${message}`);
}

function isDate(d: unknown): d is Date {
  return d instanceof Date && !Number.isNaN(d.getTime());
}

export function iso(d: Date): string {
  return d.toISOString();
}

export function daysText(ms: number): string {
  const d = ms / DAY_MS;
  return `${Math.round(d * 10) / 10} d`;
}

export function numText(n: number): string {
  return String(Math.round(n * 1000) / 1000);
}

export function validate(input: PlanInput): void {
  if (!input || typeof input !== 'object') fail('input object is required');
  if (!isDate(input.now)) fail('now must be a valid Date');
  if (!isDate(input.startedAt)) fail('startedAt must be a valid Date');
  if (input.lastDoneAt !== null && !isDate(input.lastDoneAt)) fail('lastDoneAt must be a valid Date or null');
  if (input.lastRaisedKey !== null && typeof input.lastRaisedKey !== 'string') fail('lastRaisedKey must be a string or null');
  if (!Array.isArray(input.triggers) || input.triggers.length === 0) fail('at least one trigger is required');
  const ds = input.dueSoon ?? {};
  if (ds.days !== undefined && (!Number.isFinite(ds.days) || ds.days < 0)) fail(`dueSoon.days must be a number ≥ 0, got ${String(ds.days)}`);
  if (ds.fraction !== undefined && (!Number.isFinite(ds.fraction) || ds.fraction < 0 || ds.fraction >= 1)) {
    fail(`dueSoon.fraction must be ≥ 0 and < 1, got ${String(ds.fraction)}`);
  }
  input.triggers.forEach((t, i) => {
    const where = `triggers[${i}]`;
    if (!t || typeof t !== 'object') fail(`${where} must be an object`);
    switch (t.kind) {
      case 'calendar-fixed':
        if (typeof t.ical !== 'string' || t.ical.trim() === '') fail(`${where} (calendar-fixed) needs ical text`);
        break;
      case 'calendar-floating':
        if (!Number.isInteger(t.every) || t.every < 1) fail(`${where} (calendar-floating) every must be a positive integer, got ${String(t.every)}`);
        if (t.unit !== 'day' && t.unit !== 'week' && t.unit !== 'month')
          fail(`${where} (calendar-floating) unit must be day, week or month, got ${String(t.unit)}`);
        try {
          canonicalZone(t.tz);
        } catch {
          fail(`${where} (calendar-floating) tz "${String(t.tz)}" is not a known IANA time zone`);
        }
        break;
      case 'meter':
        if (!Number.isFinite(t.every) || t.every <= 0) fail(`${where} (meter) every must be a positive number, got ${String(t.every)}`);
        checkMeter(input, t.meterId, where);
        break;
      case 'condition':
        if (t.above === undefined && t.below === undefined) fail(`${where} (condition) needs above or below`);
        if (t.above !== undefined && !Number.isFinite(t.above)) fail(`${where} (condition) above must be a finite number`);
        if (t.below !== undefined && !Number.isFinite(t.below)) fail(`${where} (condition) below must be a finite number`);
        if (t.above !== undefined && t.below !== undefined && !(t.below < t.above)) {
          fail(`${where} (condition) below (${t.below}) must be less than above (${t.above})`);
        }
        checkMeter(input, t.meterId, where);
        break;
      default:
        fail(`${where} has unknown kind "${String((t as { kind?: unknown }).kind)}"`);
    }
  });
}

function checkMeter(input: PlanInput, meterId: string, where: string): void {
  if (typeof meterId !== 'string' || meterId === '') fail(`${where} needs a meterId`);
  const m = input.meters?.[meterId];
  if (!m) fail(`${where} refers to meter "${meterId}", which is not in meters`);
  if (!Number.isFinite(m.baseline)) fail(`meter "${meterId}" baseline must be a finite number`);
  const recent = m.recent ?? [];
  if (!checkedReadings.has(recent)) {
    recent.forEach((r, i) => checkReading(r, meterId, i));
    checkedReadings.add(recent);
  }
  if (m.latest) checkReading(m.latest, meterId, recent.length);
}

const checkedReadings = new WeakSet<Reading[]>();

function checkReading(r: Reading, meterId: string, i: number): void {
  if (!r || !isDate(r.at) || !Number.isFinite(r.value)) fail(`meter "${meterId}" has an invalid reading (#${i}): needs a valid Date and a finite value`);
}

// Plans on one machine share its meters' reading lists (the server passes the same arrays), so the
// sorted list and its usage rate are worked out once per list. Inputs are treated as immutable.
const sortedReadings = new WeakMap<Reading[], { latest: Reading | null; sorted: Reading[] }>();
const usageRates = new WeakMap<Reading[], number | null>();

/** Readings in time order, one per instant (`latest` wins a tie). */
export function readingsOf(m: MeterInput): Reading[] {
  const recent = m.recent ?? [];
  const latest = m.latest ?? null;
  const known = sortedReadings.get(recent);
  if (known !== undefined && known.latest === latest) return known.sorted;
  const byTime = new Map<number, Reading>();
  for (const r of recent) byTime.set(r.at.getTime(), r);
  if (latest) byTime.set(latest.at.getTime(), latest);
  const sorted = [...byTime.values()].sort((a, b) => a.at.getTime() - b.at.getTime());
  sortedReadings.set(recent, { latest, sorted });
  return sorted;
}

/** Usage rate per calendar day over the forecast window (../forecast windowedUsageRate), once per list. */
export function usageRateOf(readings: Reading[]): number | null {
  let rate = usageRates.get(readings);
  if (rate === undefined) {
    rate = windowedUsageRate(readings)?.ratePerDay ?? null;
    usageRates.set(readings, rate);
  }
  return rate;
}

/** The instant just past `ms`: a status decided with a strict ">" changes one millisecond later. */
export function justAfter(ms: number): Date {
  return new Date(ms + 1);
}

export function calendarWindowMs(ds: DueSoonWindow, intervalMs: number): number {
  return Math.max((ds.days ?? 0) * DAY_MS, (ds.fraction ?? 0) * Math.max(intervalMs, 0));
}
