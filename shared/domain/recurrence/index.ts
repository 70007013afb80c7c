/**
 * Expansion of RFC 5545 recurrence text (a DTSTART line plus one RRULE line)
 * into real instants, correct across daylight-saving changes.
 *
 * Approach: rrule's own TZID handling depends on the host's time zone, so we
 * never give it a zone. We expand in "floating wall-clock" time — the local
 * wall time written as if it were UTC — and turn each wall-clock result into an
 * instant ourselves with the zone's offsets (luxon's IANAZone). 09:00 local
 * therefore stays 09:00 local on both sides of a change.
 *
 * Pure: no I/O, no Node-only modules; runs in the browser too.
 */
import { DEFAULT_RECURRENCE_LIMIT, RecurrenceError, SLACK_MS, fail, type ExpandOptions, type RecurrencePart, type WallClock } from './types';
import { formatWallIcal, parseRecurrence } from './parse';
import { canonicalZone, instantToWall, makeZone, wallToInstant } from './zone';
import { prepare } from './prepare';
import { expandFromWindow, periodMs, previousFromWindow, walk, type Visit } from './walk';

export {
  DEFAULT_RECURRENCE_LIMIT,
  MAX_RECURRENCE_SCAN,
  RecurrenceError,
  type RecurrencePart,
  type ExpandOptions,
  type NonexistentTimePolicy,
  type ParsedRecurrence,
  type UntilValue,
  type WallClock,
} from './types';
export { parseRecurrence } from './parse';
export { canonicalZone, localToInstant } from './zone';

function checkDate(d: Date | undefined, name: string): number | null {
  if (d === undefined) return null;
  if (!(d instanceof Date) || Number.isNaN(d.getTime())) fail(`${name} must be a valid Date`);
  return d.getTime();
}

/**
 * Instants of an RFC 5545 recurrence (§3.8.2.4 DTSTART + §3.8.5.3 RRULE, RECUR syntax §3.3.10),
 * in time order, within the optional bounds, at most `limit` of them.
 *
 * - TZID starts stay at the same local time across DST changes (RFC 5545 §3.8.5.3 examples).
 * - Ambiguous local times (fall-back) are the first occurrence (RFC 5545 §3.3.5).
 * - A DTSTART that does not exist in its zone is rejected.
 * - Generated instances in a gap are shifted forward by the gap by default (RFC 5545 §3.3.5
 *   reading) or skipped with `nonexistent: 'skip'` (RFC 5545 §3.3.10).
 * - If DTSTART does not match the rule it is not an occurrence (rrule/dateutil behaviour; the
 *   RFC calls that set undefined). Duplicate instants are returned once.
 */
export function expandRecurrence(ical: string, options: ExpandOptions = {}): Date[] {
  const limit = options.limit ?? DEFAULT_RECURRENCE_LIMIT;
  if (!Number.isInteger(limit) || limit < 1) fail(`limit must be a positive integer, got ${String(limit)}`);
  const afterMs = checkDate(options.after, 'after');
  const beforeMs = checkDate(options.before, 'before');
  const inclusive = options.inclusive ?? false;
  const prep = prepare(ical, options.floatingZone, options.nonexistent);
  const afterWall = afterMs === null ? -Infinity : instantToWall(afterMs, prep.zone);
  const beforeWall = beforeMs === null ? Infinity : instantToWall(beforeMs, prep.zone);
  if (afterMs !== null && beforeMs !== null && beforeMs < afterMs) return [];
  if (afterMs !== null && options.skipAhead !== false) {
    const fromWindow = expandFromWindow(prep, afterMs, afterWall, beforeMs, inclusive, limit);
    if (fromWindow !== null) return fromWindow.map((ms) => new Date(ms));
  }

  const found: number[] = [];
  let cutoffWall = Infinity;
  walk(
    prep,
    afterWall - SLACK_MS,
    ({ wallMs, ms }) => {
      if (wallMs > beforeWall + SLACK_MS || wallMs > cutoffWall) return false;
      if (ms === null) return true;
      if (afterMs !== null && (inclusive ? ms < afterMs : ms <= afterMs)) return true;
      if (beforeMs !== null && (inclusive ? ms > beforeMs : ms >= beforeMs)) return true;
      found.push(ms);
      // Gap shifts can reorder instants slightly; keep going a little past the limit, then sort.
      if (found.length >= limit && cutoffWall === Infinity) cutoffWall = wallMs + SLACK_MS;
      return true;
    },
    options.skipAhead ?? true,
  );
  found.sort((a, b) => a - b);
  const out: Date[] = [];
  for (const ms of found) {
    if (out.length > 0 && out[out.length - 1].getTime() === ms) continue;
    out.push(new Date(ms));
    if (out.length >= limit) break;
  }
  return out;
}

/**
 * The last instant of the recurrence before `at` (or at it, with `inclusive`), or null.
 * Same rules as {@link expandRecurrence}; RFC 5545 §3.8.5.3.
 */
export function previousOccurrence(
  ical: string,
  at: Date,
  options: Pick<ExpandOptions, 'inclusive' | 'floatingZone' | 'nonexistent' | 'skipAhead'> = {},
): Date | null {
  if (at === undefined) fail('at is required');
  const atMs = checkDate(at, 'at') as number;
  const prep = prepare(ical, options.floatingZone, options.nonexistent);
  const atWall = instantToWall(atMs, prep.zone);
  const inclusive = options.inclusive ?? false;
  if (options.skipAhead !== false) {
    const fromWindow = previousFromWindow(prep, atMs, atWall, inclusive);
    if (fromWindow !== null) return fromWindow.ms === null ? null : new Date(fromWindow.ms);
  }
  let best: number | null = null;
  let lastUnconverted: number | null = null;
  const visit = ({ wallMs, ms }: Visit): boolean => {
    if (wallMs > atWall + SLACK_MS) return false;
    if (ms === null) {
      // rrule yields a day's times in BYHOUR/BYMINUTE order as written, not sorted: keep the latest.
      if (lastUnconverted === null || wallMs > lastUnconverted) lastUnconverted = wallMs;
      return true;
    }
    if ((inclusive ? ms <= atMs : ms < atMs) && (best === null || ms > best)) best = ms;
    return true;
  };
  const skipAhead = options.skipAhead ?? true;
  let { skipped } = walk(prep, atWall - SLACK_MS, visit, skipAhead);
  // The answer may lie before the skipped-to period (a sparse rule, or an instance at the start of
  // its period): look a few periods further back, then walk from DTSTART.
  for (const periods of [2, 16]) {
    if (!skipped || best !== null || lastUnconverted !== null) break;
    skipped = walk(prep, atWall - SLACK_MS, visit, true, atWall - SLACK_MS - periods * periodMs(prep)).skipped;
  }
  if (skipped && best === null && lastUnconverted === null) walk(prep, atWall - SLACK_MS, visit);
  if (best === null && lastUnconverted !== null) {
    // Only reached when conversion was skipped, i.e. shift-forward policy: every wall time converts.
    best = wallToInstant(lastUnconverted, prep.zone).ms;
  }
  return best === null ? null : new Date(best);
}

/**
 * Checks recurrence text for a form: parses it (RFC 5545 §3.3.10 grammar and MUST rules) and
 * rejects a DTSTART that does not exist in its zone (RFC 5545 §3.3.5 gap).
 */
export function validateRecurrence(
  ical: string,
  options: Pick<ExpandOptions, 'floatingZone'> = {},
): { ok: true } | { ok: false; error: string; part: RecurrencePart } {
  try {
    const prep = prepare(ical, options.floatingZone, undefined);
    let any = false;
    walk(prep, -Infinity, () => {
      any = true;
      return false;
    });
    if (!any) fail('the rule produces no occurrences');
    return { ok: true };
  } catch (e) {
    return { ok: false, error: e instanceof Error ? e.message : String(e), part: e instanceof RecurrenceError ? e.part : 'rule' };
  }
}

export interface BuildRecurrenceInput {
  /** An instant (rendered as wall-clock time in `tzid`) or a local ISO string `YYYY-MM-DDTHH:mm[:ss]`. */
  start: Date | string;
  /** IANA zone id, or 'UTC' for a `...Z` DTSTART. */
  tzid: string;
  /** RRULE value, with or without the `RRULE:` prefix, e.g. `FREQ=WEEKLY;BYDAY=MO`. */
  rrule: string;
}

/**
 * Builds DTSTART + RRULE text (RFC 5545 §3.8.2.4, §3.8.5.3) from form fields and validates it.
 * Lines are separated by LF (the parser accepts CRLF and LF). Throws an Error naming the problem.
 */
export function buildRecurrenceText(input: BuildRecurrenceInput): string {
  const tz = canonicalZone(input.tzid);
  const isUtc = tz === 'UTC' || tz === 'Etc/UTC';
  let wall: WallClock;
  if (input.start instanceof Date) {
    if (Number.isNaN(input.start.getTime())) fail('start is an invalid Date', 'start');
    const w = new Date(instantToWall(input.start.getTime(), makeZone(tz)));
    wall = {
      year: w.getUTCFullYear(),
      month: w.getUTCMonth() + 1,
      day: w.getUTCDate(),
      hour: w.getUTCHours(),
      minute: w.getUTCMinutes(),
      second: w.getUTCSeconds(),
    };
  } else if (typeof input.start === 'string') {
    const m = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})(?::(\d{2}))?$/.exec(input.start.trim());
    if (!m) fail(`start "${input.start}" is not a local ISO date-time YYYY-MM-DDTHH:mm[:ss] (no offset, no Z)`, 'start');
    wall = {
      year: Number(m[1]),
      month: Number(m[2]),
      day: Number(m[3]),
      hour: Number(m[4]),
      minute: Number(m[5]),
      second: m[6] === undefined ? 0 : Number(m[6]),
    };
  } else {
    fail('start must be a Date or a local ISO string', 'start');
  }
  const rule = input.rrule.trim().replace(/^RRULE:/i, '');
  const stamp = formatWallIcal(wall, false);
  const dtstart = isUtc ? `DTSTART:${stamp}Z` : `DTSTART;TZID=${tz}:${stamp}`;
  const draft = `${dtstart}\nRRULE:${rule}`;
  const check = validateRecurrence(draft);
  if (!check.ok) throw new RecurrenceError(check.error.replace(/^recurrence: /, ''), check.part);
  // Store the normalised rule (upper case, FREQ first) so equal schedules compare equal.
  return `${dtstart}\nRRULE:${parseRecurrence(draft).rrule}`;
}
