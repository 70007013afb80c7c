/**
 * Parsed rules made ready to walk (zone, gap policy, rrule object), cached by text, and the
 * skip-ahead that starts a walk near the range asked about instead of at DTSTART.
 */
import { RRule, Frequency, Weekday, type Options as RRuleOptions } from '../rrule';
import { DAY_MS, PROBE_LAST_YEAR, SLACK_MS, fail, type Internal, type NonexistentTimePolicy, type ParsedRecurrence } from './types';
import { parseInternal } from './parse';
import { canonicalZone, instantToWall, makeZone, wallToInstant, type ZoneConv } from './zone';

export interface Prepared {
  internal: Internal;
  zone: ZoneConv;
  policy: NonexistentTimePolicy;
  rule: RRule;
  /**
   * The rule's options with every part rrule would default from DTSTART written out, so DTSTART
   * can be moved to a later period start without changing the set; null when moving is not
   * provably equivalent (COUNT, YEARLY). See {@link skipAheadRule}.
   */
  skipBase: Partial<RRuleOptions> | null;
  /** Calls answered so far; a window is built only for a rule asked about repeatedly. */
  uses: number;
  window: OccurrenceWindow | null;
}

/**
 * Every instant of a rule whose wall time lies in [fromWall, toWall], sorted and without
 * duplicates. `complete`: the rule has no instance after toWall; `fromStart`: none before fromWall.
 */
export interface OccurrenceWindow {
  fromWall: number;
  toWall: number;
  complete: boolean;
  fromStart: boolean;
  ms: number[];
}

/** Rejects a rule with no instance in the 100-500 years after DTSTART (see PROBE_LAST_YEAR). */
function assertHasInstances(internal: Internal): void {
  const start = new Date(internal.startWallMs);
  const year = start.getUTCFullYear();
  const cycles = Math.floor((PROBE_LAST_YEAR - year) / 400);
  const probeStart = new Date(internal.startWallMs);
  if (cycles > 0) probeStart.setUTCFullYear(year + 400 * cycles);
  const probe = new RRule({ ...internal.options, dtstart: probeStart, tzid: null, count: null, until: null }, true);
  let any = false;
  probe.all(() => {
    any = true;
    return false;
  });
  if (!any) fail('the rule produces no occurrences (none within 100 years of DTSTART)');
}

/**
 * Parsed, checked rules by text and options. Plans share few distinct rule texts, and parsing plus
 * the no-instances probe cost far more than a short walk. Prepared values are never mutated (but for the window below) and the
 * RRule is built with noCache, so sharing is safe. Failures are not cached (they rethrow anew).
 */
const PREPARED_CACHE_SIZE = 1000;
const preparedCache = new Map<string, Prepared>();

export function prepare(ical: string, floatingZone: string | undefined, policy: NonexistentTimePolicy | undefined): Prepared {
  if (typeof ical !== 'string') return prepareUncached(ical, floatingZone, policy);
  const key = `${floatingZone ?? ''}\u0000${policy ?? ''}\u0000${ical}`;
  let prep = preparedCache.get(key);
  if (prep !== undefined) {
    // Least recently used first: move a hit to the end.
    preparedCache.delete(key);
    preparedCache.set(key, prep);
    return prep;
  }
  prep = prepareUncached(ical, floatingZone, policy);
  if (preparedCache.size >= PREPARED_CACHE_SIZE) preparedCache.delete(preparedCache.keys().next().value as string);
  preparedCache.set(key, prep);
  return prep;
}

function prepareUncached(ical: string, floatingZone: string | undefined, policy: NonexistentTimePolicy | undefined): Prepared {
  const internal = parseInternal(ical);
  const p = internal.parsed;
  const zoneId = p.tzid ?? canonicalZone(floatingZone ?? 'UTC');
  const zone = makeZone(zoneId);
  const pol = policy ?? 'shift-forward';
  if (pol !== 'shift-forward' && pol !== 'skip') fail(`nonexistent must be 'shift-forward' or 'skip', got "${String(pol)}"`);
  if (!p.dateOnly && wallToInstant(internal.startWallMs, zone).gap) {
    fail(`DTSTART ${p.startLocal} does not exist in ${zoneId} (it falls in a daylight-saving gap); choose a time outside the gap`, 'start');
  }
  assertHasInstances(internal);
  // Bound rrule by UNTIL plus slack; the exact UNTIL test (instant or wall clock) is in walk().
  let untilWall: number | null = null;
  if (p.until) {
    untilWall = p.until.kind === 'utc' ? instantToWall(p.until.instantMs, zone) : p.until.wallMs;
  }
  const options: Partial<RRuleOptions> = {
    ...internal.options,
    dtstart: new Date(internal.startWallMs),
    tzid: null,
    count: null,
    until: untilWall === null ? null : new Date(Math.max(untilWall, internal.startWallMs) + SLACK_MS),
  };
  // noCache: results depend on our own filters, and rrule's cache would keep every Date alive.
  const rule = new RRule(options, true);
  return { internal, zone, policy: p.dateOnly ? 'shift-forward' : pol, rule, skipBase: skipBaseOf(p, options), uses: 0, window: null };
}

/**
 * Options for {@link skipAheadRule}, or null. Only without COUNT (counting needs every instance
 * from DTSTART) and only for DAILY, WEEKLY and MONTHLY, whose periods are whole days, weeks (from
 * WKST) and months; YEARLY is skipped (BYWEEKNO periods spill across years, and it walks little).
 * Mirrors rrule's parseOptions defaults: BYxxx parts taken from DTSTART when none is given.
 */
function skipBaseOf(p: ParsedRecurrence, options: Partial<RRuleOptions>): Partial<RRuleOptions> | null {
  if (p.count !== null) return null;
  if (p.freq !== 'DAILY' && p.freq !== 'WEEKLY' && p.freq !== 'MONTHLY') return null;
  const start = options.dtstart as Date;
  const o: Partial<RRuleOptions> = { ...options };
  // parseRuleValue never leaves an empty list, so "present" is rrule's "given" here.
  const hasDayPart = o.byweekno != null || o.byyearday != null || o.bymonthday != null || o.byweekday != null;
  if (!hasDayPart) {
    if (p.freq === 'MONTHLY') o.bymonthday = [start.getUTCDate()];
    if (p.freq === 'WEEKLY') o.byweekday = [new Weekday((start.getUTCDay() + 6) % 7)];
  }
  if (o.byhour == null) o.byhour = [start.getUTCHours()];
  if (o.byminute == null) o.byminute = [start.getUTCMinutes()];
  if (o.bysecond == null) o.bysecond = [start.getUTCSeconds()];
  return o;
}

/**
 * An RRule equal to `prep.rule` on and after its own DTSTART, which is the start (00:00 wall) of
 * the last FREQ×INTERVAL period that begins at or before `lowWall`; null when that would not move
 * DTSTART forward or the rule cannot be moved. Every instance before `lowWall` that it drops is one
 * the callers would not convert anyway; the new first period is whole, like every original period
 * after the first, so BYSETPOS picks the same instances.
 */
export function skipAheadRule(prep: Prepared, lowWall: number): RRule | null {
  const base = prep.skipBase;
  if (base === null || !Number.isFinite(lowWall)) return null;
  const startMs = prep.internal.startWallMs;
  if (lowWall <= startMs) return null;
  const interval = base.interval ?? 1;
  const startDay = Math.floor(startMs / DAY_MS);
  const targetDay = Math.floor(lowWall / DAY_MS);
  let newStart: number;
  if (base.freq === Frequency.MONTHLY) {
    const s = new Date(startMs);
    const t = new Date(lowWall);
    const m0 = s.getUTCFullYear() * 12 + s.getUTCMonth();
    const k = Math.floor((t.getUTCFullYear() * 12 + t.getUTCMonth() - m0) / interval);
    if (k < 1) return null;
    const m = m0 + k * interval;
    const d = new Date(0);
    d.setUTCFullYear(Math.floor(m / 12), m % 12, 1);
    newStart = d.getTime();
  } else {
    // rrule numbers weekdays Monday = 0; a WEEKLY period starts on WKST (default Monday).
    const periodStart =
      base.freq === Frequency.WEEKLY ? startDay - ((((new Date(startMs).getUTCDay() + 6) % 7) - ((base.wkst as number | undefined) ?? 0) + 7) % 7) : startDay;
    const stride = base.freq === Frequency.WEEKLY ? 7 * interval : interval;
    const k = Math.floor((targetDay - periodStart) / stride);
    if (k < 1) return null;
    newStart = (periodStart + k * stride) * DAY_MS;
  }
  if (newStart <= startMs || newStart > lowWall) return null;
  return new RRule({ ...base, dtstart: new Date(newStart) }, true);
}
