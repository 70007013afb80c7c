/**
 * Decision logic of the maintenance due engine: given a plan's triggers ("whichever comes
 * first"), its last completion and the meter readings, say whether work is due and give the
 * occurrence a deterministic key so the server can insert it under a unique constraint and never
 * raise it twice.
 *
 * Rules this module defines (house rules, not from a standard):
 *
 * - Status comes from completion: a trigger stays due until the plan is done again. Raising a
 *   work order does not clear it.
 * - Due-soon window before a due point, and the same window as grace after it:
 *     calendar triggers  window = max(days, fraction × interval)   (interval: between occurrences,
 *                        or N units for a floating trigger); grace = max(window, 1 day)
 *     meter triggers     window = fraction × every (meter units); grace is the same number of
 *                        units, or — without a fraction — max(days, 1 day) since the meter crossed;
 *                        also due-soon when the usage forecast reaches the mark within `days`
 *     condition triggers due-soon within fraction × |limit| of the limit or when the trend reaches
 *                        it within `days`; grace = max(days, 1 day) since the first reading past it
 *   Past the due point by no more than the grace → 'due'; by more → 'overdue'. The 1-day floor keeps
 *   a plan falling due at 09:00 'due' for that day instead of 'overdue' a minute later.
 * - Fixed calendar: an occurrence counts as done if the plan was completed at or after
 *   (occurrence − its due-soon window), so work done early in the window is not asked for again.
 *   Occurrences before the plan's start are ignored.
 * - One current occurrence per plan: after downtime the key is that of the most recent missed
 *   calendar occurrence, not one per missed occurrence; and while a key raised since the last
 *   completion is still current (`lastRaisedKey`), it is returned again, so a second trigger
 *   firing for the same outstanding work does not raise a second work order.
 *
 * - `changesAt`: the earliest instant at which the status can change with time alone (same
 *   triggers, completion and readings). Until then the result stays valid, so the engine can
 *   skip re-evaluating a plan whose inputs did not change. Null when only new input changes it.
 *
 * Pure: no I/O; runs in the browser too.
 */
import { DateTime } from 'luxon';
import { canonicalZone as canonicalZoneUncached, expandRecurrence, previousOccurrence } from './recurrence';
import { usageRatePerDay } from './forecast';
import { cachedZone } from './zone-offsets';

const DAY_MS = 86_400_000;

// Zone names are few and their lookup (Intl) is slow; the answer for a name never changes.
const zoneNames = new Map<string, string>();
function canonicalZone(tz: string): string {
  let z = zoneNames.get(tz);
  if (z === undefined) {
    z = canonicalZoneUncached(tz);
    if (zoneNames.size < 1000) zoneNames.set(tz, z);
  }
  return z;
}
/** Minimum grace after a due point (see module comment). */
export const MIN_GRACE_MS = DAY_MS;
/** How many fixed-calendar occurrences after the last completion are checked for early completion. */
const COVER_SCAN = 64;

export type Trigger =
  | { kind: 'calendar-fixed'; ical: string }
  | { kind: 'calendar-floating'; every: number; unit: 'day' | 'week' | 'month'; tz: string }
  | { kind: 'meter'; meterId: string; every: number }
  | { kind: 'condition'; meterId: string; above?: number; below?: number };

export interface Reading {
  at: Date;
  value: number;
}

export interface MeterInput {
  /** Meter value at the last completion (or when the plan started). */
  baseline: number;
  latest: Reading | null;
  /** Recent readings for the usage trend; may include `latest`. */
  recent: Reading[];
}

export interface DueSoonWindow {
  days?: number;
  fraction?: number;
}

export interface PlanInput {
  now: Date;
  startedAt: Date;
  lastDoneAt: Date | null;
  lastRaisedKey: string | null;
  triggers: Trigger[];
  meters: Record<string, MeterInput>;
  dueSoon: DueSoonWindow;
}

export type DueStatus = 'not-due' | 'due-soon' | 'due' | 'overdue';

export interface TriggerEvaluation {
  index: number;
  kind: Trigger['kind'];
  status: DueStatus;
  /** Calendar due point, meter crossing/forecast time, or condition crossing/forecast time. */
  dueAt: Date | null;
  /** Key of this trigger's occurrence when it is due or overdue, else null. */
  key: string | null;
  reason: string;
  /** Earliest instant at which this trigger's status can change by the passing of time alone, or null. */
  changesAt: Date | null;
}

export interface MeterDue {
  meterId: string;
  dueValue: number;
  current: number | null;
  /** When the meter reached dueValue (estimated between readings) or is forecast to. */
  forecastAt: Date | null;
}

export interface Evaluation {
  status: DueStatus;
  /** Earliest due point over all triggers (calendar date, meter crossing or forecast). */
  dueAt: Date | null;
  dueMeter: MeterDue[];
  /** Human-readable: which trigger decided and why. */
  reason: string;
  /** Key of the occurrence due now (status 'due' or 'overdue'), else null. */
  occurrenceKey: string | null;
  /** occurrenceKey equals lastRaisedKey: the server has it already. */
  alreadyRaised: boolean;
  /** Index into `triggers` of the deciding trigger. */
  decidedBy: number;
  triggers: TriggerEvaluation[];
  /** Earliest `changesAt` over the triggers: re-evaluate no later than this (null: only new input changes it). */
  changesAt: Date | null;
}

const RANK: Record<DueStatus, number> = { 'not-due': 0, 'due-soon': 1, due: 2, overdue: 3 };

function fail(message: string): never {
  throw new Error(`evaluatePlan: ${message}`);
}

function isDate(d: unknown): d is Date {
  return d instanceof Date && !Number.isNaN(d.getTime());
}

function iso(d: Date): string {
  return d.toISOString();
}

function daysText(ms: number): string {
  const d = ms / DAY_MS;
  return `${Math.round(d * 10) / 10} d`;
}

function numText(n: number): string {
  return String(Math.round(n * 1000) / 1000);
}

function validate(input: PlanInput): void {
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
        if (t.unit !== 'day' && t.unit !== 'week' && t.unit !== 'month') fail(`${where} (calendar-floating) unit must be day, week or month, got ${String(t.unit)}`);
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
function readingsOf(m: MeterInput): Reading[] {
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

function usageRateOf(readings: Reading[]): number | null {
  let rate = usageRates.get(readings);
  if (rate === undefined) {
    rate = usageRatePerDay(readings);
    usageRates.set(readings, rate);
  }
  return rate;
}

/** The instant just past `ms`: a status decided with a strict ">" changes one millisecond later. */
function justAfter(ms: number): Date {
  return new Date(ms + 1);
}

function calendarWindowMs(ds: DueSoonWindow, intervalMs: number): number {
  return Math.max((ds.days ?? 0) * DAY_MS, (ds.fraction ?? 0) * Math.max(intervalMs, 0));
}

// ---------------------------------------------------------------------------
// Trigger evaluations
// ---------------------------------------------------------------------------

function evalFixed(t: Extract<Trigger, { kind: 'calendar-fixed' }>, input: PlanInput, index: number): TriggerEvaluation {
  const { now, startedAt, lastDoneAt, dueSoon } = input;
  const base = { index, kind: t.kind } as const;
  const done = lastDoneAt;
  // Occurrences at or before the last completion are done; those before the start do not count.
  const after = done !== null && done.getTime() >= startedAt.getTime() ? done : new Date(startedAt.getTime() - 1);
  // Nearly always the first or second occurrence decides; the long scan is only for work done well ahead.
  let next = expandRecurrence(t.ical, { after, limit: 2 });
  if (next.length === 0) {
    return { ...base, status: 'not-due', dueAt: null, key: null, reason: `calendar: no occurrence after ${iso(after)}`, changesAt: null };
  }
  // The interval only matters for a window that is a share of it; look back only then.
  let before0: Date | null | undefined;
  const intervalOf = (i: number): number => {
    if ((dueSoon.fraction ?? 0) <= 0) return 0;
    if (i === 0 && before0 === undefined) before0 = previousOccurrence(t.ical, next[0]);
    const prev = i === 0 ? before0 : next[i - 1];
    if (prev) return next[i].getTime() - prev.getTime();
    return i + 1 < next.length ? next[i + 1].getTime() - next[i].getTime() : 0;
  };
  let first = -1;
  let windowMs = 0;
  const scan = () => {
    for (let i = 0; i < next.length; i++) {
      const w = calendarWindowMs(dueSoon, intervalOf(i));
      const coveredEarly = done !== null && done.getTime() >= next[i].getTime() - w;
      if (!coveredEarly) {
        first = i;
        windowMs = w;
        return;
      }
    }
  };
  scan();
  if (first < 0 && next.length === 2) {
    next = expandRecurrence(t.ical, { after, limit: COVER_SCAN });
    scan();
  }
  if (first < 0) {
    return { ...base, status: 'not-due', dueAt: null, key: null, reason: `calendar: the next ${next.length} occurrences are already covered by the completion at ${iso(done as Date)}`, changesAt: null };
  }
  const dueAt = next[first];
  const sinceMs = now.getTime() - dueAt.getTime();
  if (sinceMs >= 0) {
    const latest = previousOccurrence(t.ical, now, { inclusive: true }) ?? dueAt;
    const grace = Math.max(windowMs, MIN_GRACE_MS);
    const status: DueStatus = sinceMs > grace ? 'overdue' : 'due';
    const missed = latest.getTime() !== dueAt.getTime() ? `; latest missed occurrence ${iso(latest)}` : '';
    return {
      ...base,
      status,
      dueAt,
      key: `cal:${iso(latest)}`,
      reason: `calendar occurrence ${iso(dueAt)} ${status === 'overdue' ? `is overdue by ${daysText(sinceMs)}` : 'is due'}${missed}`,
      changesAt: status === 'due' ? justAfter(dueAt.getTime() + grace) : null,
    };
  }
  const soon = -sinceMs <= windowMs;
  return {
    ...base,
    status: soon ? 'due-soon' : 'not-due',
    dueAt,
    key: null,
    reason: `next calendar occurrence ${iso(dueAt)}${soon ? ` is due in ${daysText(-sinceMs)}` : ''}`,
    changesAt: soon ? dueAt : new Date(dueAt.getTime() - windowMs),
  };
}

function evalFloating(t: Extract<Trigger, { kind: 'calendar-floating' }>, input: PlanInput, index: number): TriggerEvaluation {
  const { now, startedAt, lastDoneAt, dueSoon } = input;
  const anchor = lastDoneAt ?? startedAt;
  const zone = canonicalZone(t.tz);
  // Calendar arithmetic in the plan's zone: "1 month after 31 Jan" is the end of February and
  // "7 days after 09:00" is 09:00 local even across a DST change (luxon plus()).
  const dueAt = DateTime.fromJSDate(anchor, { zone: cachedZone(zone) }).plus({ [`${t.unit}s`]: t.every }).toJSDate();
  const windowMs = calendarWindowMs(dueSoon, dueAt.getTime() - anchor.getTime());
  const sinceMs = now.getTime() - dueAt.getTime();
  const what = `every ${t.every} ${t.unit}${t.every === 1 ? '' : 's'} since ${lastDoneAt ? 'last done' : 'plan start'} ${iso(anchor)}`;
  const base = { index, kind: t.kind, dueAt } as const;
  if (sinceMs >= 0) {
    const grace = Math.max(windowMs, MIN_GRACE_MS);
    const status: DueStatus = sinceMs > grace ? 'overdue' : 'due';
    return {
      ...base,
      status,
      key: `float:${iso(anchor)}`,
      reason: `${what}: due ${iso(dueAt)}${status === 'overdue' ? `, overdue by ${daysText(sinceMs)}` : ''}`,
      changesAt: status === 'due' ? justAfter(dueAt.getTime() + grace) : null,
    };
  }
  const soon = -sinceMs <= windowMs;
  return {
    ...base,
    status: soon ? 'due-soon' : 'not-due',
    key: null,
    reason: `${what}: due ${iso(dueAt)}`,
    changesAt: soon ? dueAt : new Date(dueAt.getTime() - windowMs),
  };
}

/** Time the readings first reached `target` in their latest run at or above it, interpolated linearly. */
function crossingTime(readings: Reading[], target: number): Date | null {
  let i = readings.length - 1;
  if (i < 0 || readings[i].value < target) return null;
  while (i > 0 && readings[i - 1].value >= target) i--;
  if (i === 0) return readings[0].at;
  const a = readings[i - 1];
  const b = readings[i];
  const f = (target - a.value) / (b.value - a.value);
  return new Date(a.at.getTime() + f * (b.at.getTime() - a.at.getTime()));
}

/** Forecast from the latest reading along the OLS usage rate (./forecast usageRatePerDay). */
function forecastFromLatest(readings: Reading[], target: number): Date | null {
  if (readings.length < 2) return null;
  const ratePerDay = usageRateOf(readings);
  const last = readings[readings.length - 1];
  if (ratePerDay === null || ratePerDay === 0) return null;
  const days = (target - last.value) / ratePerDay;
  // Anchored at the latest reading: a cumulative meter's latest value is exact, while the fitted
  // line's intercept can put the date before a reading that is still short of the target.
  if (days < 0) return null; // trend runs away from the target
  const ms = last.at.getTime() + days * DAY_MS;
  return Number.isFinite(ms) && !Number.isNaN(new Date(ms).getTime()) ? new Date(ms) : null;
}

function evalMeter(
  t: Extract<Trigger, { kind: 'meter' }>,
  input: PlanInput,
  index: number,
): { evaluation: TriggerEvaluation; meter: MeterDue } {
  const { now, dueSoon } = input;
  const m = input.meters[t.meterId];
  const readings = readingsOf(m);
  const dueValue = m.baseline + t.every;
  const last = readings.length > 0 ? readings[readings.length - 1] : null;
  const current = m.latest?.value ?? last?.value ?? null;
  const base = { index, kind: t.kind } as const;
  const label = `meter ${t.meterId}`;
  if (current === null) {
    return {
      evaluation: { ...base, status: 'not-due', dueAt: null, key: null, reason: `${label}: no reading yet (due at ${numText(dueValue)})`, changesAt: null },
      meter: { meterId: t.meterId, dueValue, current: null, forecastAt: null },
    };
  }
  const windowUnits = (dueSoon.fraction ?? 0) * t.every;
  if (current >= dueValue) {
    const crossedAt = crossingTime(readings, dueValue) ?? (m.latest?.at as Date);
    const over = current - dueValue;
    const sinceMs = now.getTime() - crossedAt.getTime();
    const graceMs = Math.max((dueSoon.days ?? 0) * DAY_MS, MIN_GRACE_MS);
    const overdue = windowUnits > 0 ? over > windowUnits : sinceMs > graceMs;
    const status: DueStatus = overdue ? 'overdue' : 'due';
    const overText = !overdue ? '' : windowUnits > 0 ? `, overdue by ${numText(over)}` : `, overdue: reached about ${daysText(sinceMs)} ago`;
    return {
      evaluation: {
        ...base,
        status,
        dueAt: crossedAt,
        key: `meter:${t.meterId}:${dueValue}`,
        reason: `${label} reads ${numText(current)}, due at ${numText(dueValue)} (every ${numText(t.every)} from ${numText(m.baseline)})${overText}`,
        // With a unit window only new readings make it overdue; without one, time since the crossing does.
        changesAt: !overdue && windowUnits <= 0 ? justAfter(crossedAt.getTime() + graceMs) : null,
      },
      meter: { meterId: t.meterId, dueValue, current, forecastAt: crossedAt },
    };
  }
  const forecastAt = forecastFromLatest(readings, dueValue);
  const byUnits = windowUnits > 0 && dueValue - current <= windowUnits;
  const byTime = dueSoon.days !== undefined && forecastAt !== null && forecastAt.getTime() - now.getTime() <= dueSoon.days * DAY_MS;
  const soon = byUnits || byTime;
  return {
    evaluation: {
      ...base,
      status: soon ? 'due-soon' : 'not-due',
      dueAt: forecastAt,
      key: null,
      reason: `${label} reads ${numText(current)} of ${numText(dueValue)}${forecastAt ? `, forecast ${iso(forecastAt)}` : ''}`,
      changesAt: !soon && dueSoon.days !== undefined && forecastAt !== null ? new Date(forecastAt.getTime() - dueSoon.days * DAY_MS) : null,
    },
    meter: { meterId: t.meterId, dueValue, current, forecastAt },
  };
}

function evalCondition(t: Extract<Trigger, { kind: 'condition' }>, input: PlanInput, index: number): TriggerEvaluation {
  const { now, lastDoneAt, dueSoon } = input;
  const base = { index, kind: t.kind } as const;
  const label = `meter ${t.meterId}`;
  // Only readings taken after the last completion describe the serviced machine.
  const readings = readingsOf(input.meters[t.meterId]).filter((r) => lastDoneAt === null || r.at.getTime() > lastDoneAt.getTime());
  const crosses = (v: number) => (t.above !== undefined && v > t.above) || (t.below !== undefined && v < t.below);
  const limitText = [t.above !== undefined ? `above ${numText(t.above)}` : '', t.below !== undefined ? `below ${numText(t.below)}` : '']
    .filter(Boolean)
    .join(' or ');
  if (readings.length === 0) {
    return { ...base, status: 'not-due', dueAt: null, key: null, reason: `${label}: no reading${lastDoneAt ? ' since last done' : ''} (limit: ${limitText})`, changesAt: null };
  }
  const last = readings[readings.length - 1];
  if (crosses(last.value)) {
    let i = readings.length - 1;
    while (i > 0 && crosses(readings[i - 1].value)) i--;
    const firstPast = readings[i];
    const sinceMs = now.getTime() - firstPast.at.getTime();
    const graceMs = Math.max((dueSoon.days ?? 0) * DAY_MS, MIN_GRACE_MS);
    const status: DueStatus = sinceMs > graceMs ? 'overdue' : 'due';
    return {
      ...base,
      status,
      dueAt: firstPast.at,
      key: `cond:${t.meterId}:${iso(firstPast.at)}`,
      reason: `${label} reads ${numText(last.value)} (limit: ${limitText}) since ${iso(firstPast.at)}`,
      changesAt: status === 'due' ? justAfter(firstPast.at.getTime() + graceMs) : null,
    };
  }
  const f = dueSoon.fraction ?? 0;
  const near =
    f > 0 &&
    ((t.above !== undefined && last.value >= t.above - f * Math.abs(t.above)) ||
      (t.below !== undefined && last.value <= t.below + f * Math.abs(t.below)));
  const forecasts = [t.above, t.below]
    .filter((x): x is number => x !== undefined)
    .map((limit) => forecastFromLatest(readings, limit))
    .filter((d): d is Date => d !== null)
    .sort((a, b) => a.getTime() - b.getTime());
  const forecastAt = forecasts[0] ?? null;
  const byTrend = dueSoon.days !== undefined && forecastAt !== null && forecastAt.getTime() - now.getTime() <= dueSoon.days * DAY_MS;
  return {
    ...base,
    status: near || byTrend ? 'due-soon' : 'not-due',
    dueAt: forecastAt,
    key: null,
    reason: `${label} reads ${numText(last.value)} (limit: ${limitText})${forecastAt ? `, trend reaches it ${iso(forecastAt)}` : ''}`,
    changesAt: !(near || byTrend) && dueSoon.days !== undefined && forecastAt !== null ? new Date(forecastAt.getTime() - dueSoon.days * DAY_MS) : null,
  };
}

/** Is `key` an occurrence raised since the last completion (so the work it stands for is still open)? */
function isCurrentCycleKey(key: string, input: PlanInput): boolean {
  const done = input.lastDoneAt?.getTime() ?? null;
  const cycleStart = input.lastDoneAt ?? input.startedAt;
  if (key.startsWith('cal:')) {
    const t = Date.parse(key.slice(4));
    return Number.isFinite(t) && t >= input.startedAt.getTime() && (done === null || t > done);
  }
  if (key.startsWith('float:')) return Date.parse(key.slice(6)) === cycleStart.getTime();
  if (key.startsWith('meter:')) {
    const rest = key.slice(6);
    const cut = rest.lastIndexOf(':');
    const m = input.meters[rest.slice(0, cut)];
    const v = Number(rest.slice(cut + 1));
    return cut > 0 && m !== undefined && Number.isFinite(v) && v > m.baseline;
  }
  const c = /^cond:(.+):(\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}\.\d{3}Z)$/.exec(key);
  if (c) {
    const t = Date.parse(c[2]);
    return input.meters[c[1]] !== undefined && (done === null || t > done);
  }
  return false;
}

/**
 * Evaluates a maintenance plan's triggers, whichever comes first. Calendar rules follow
 * RFC 5545 (§3.8.5.3 RRULE via ./recurrence); the meter forecast uses the ordinary least-squares
 * usage rate (NIST e-Handbook §4.4.3.1, via ./forecast). Due-soon, grace and key rules are the
 * house rules in this module's header comment. Throws an Error naming any bad input.
 */
export function evaluatePlan(input: PlanInput): Evaluation {
  validate(input);
  const triggers: TriggerEvaluation[] = [];
  const dueMeter: MeterDue[] = [];
  input.triggers.forEach((t, i) => {
    switch (t.kind) {
      case 'calendar-fixed':
        triggers.push(evalFixed(t, input, i));
        break;
      case 'calendar-floating':
        triggers.push(evalFloating(t, input, i));
        break;
      case 'meter': {
        const r = evalMeter(t, input, i);
        triggers.push(r.evaluation);
        dueMeter.push(r.meter);
        break;
      }
      case 'condition':
        triggers.push(evalCondition(t, input, i));
        break;
    }
  });
  const order = [...triggers].sort(
    (a, b) =>
      RANK[b.status] - RANK[a.status] ||
      (a.dueAt?.getTime() ?? Infinity) - (b.dueAt?.getTime() ?? Infinity) ||
      a.index - b.index,
  );
  const decider = order[0];
  const dueTimes = triggers.map((t) => t.dueAt?.getTime()).filter((x): x is number => x !== undefined);
  const dueAt = dueTimes.length > 0 ? new Date(Math.min(...dueTimes)) : null;
  let occurrenceKey: string | null = null;
  let reason = decider.reason;
  if (decider.status === 'due' || decider.status === 'overdue') {
    const raised = input.lastRaisedKey;
    if (raised !== null && isCurrentCycleKey(raised, input)) {
      occurrenceKey = raised;
      if (raised !== decider.key) reason += ` (work already raised as ${raised})`;
    } else {
      occurrenceKey = decider.key;
    }
  }
  return {
    status: decider.status,
    dueAt,
    dueMeter,
    reason,
    occurrenceKey,
    alreadyRaised: occurrenceKey !== null && occurrenceKey === input.lastRaisedKey,
    decidedBy: decider.index,
    triggers,
    changesAt: earliest(triggers.map((t) => t.changesAt)),
  };
}

function earliest(dates: (Date | null)[]): Date | null {
  let best: Date | null = null;
  for (const d of dates) if (d !== null && (best === null || d.getTime() < best.getTime())) best = d;
  return best;
}
