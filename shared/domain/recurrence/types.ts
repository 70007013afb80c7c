/**
 * Types, limits and small wall-clock helpers shared by the recurrence parser, the zone
 * conversion, the walk and the public API (see ./index.ts for the approach).
 */
import { Frequency } from '../rrule';
import type { Options as RRuleOptions } from '../rrule';

export const MINUTE_MS = 60_000;
export const DAY_MS = 86_400_000;
/** Wider than any UTC offset (±14 h) plus any DST gap (≤ 24 h, Pacific/Apia 2011). */
export const SLACK_MS = 2 * DAY_MS;
/** Default cap on returned occurrences, so an unbounded rule cannot run away. */
export const DEFAULT_RECURRENCE_LIMIT = 1000;
/**
 * rrule looks for the next instance up to the year 9999 without calling back, so a rule with
 * no instances at all (e.g. FREQ=DAILY;BYMONTH=2;BYMONTHDAY=30) would spin for seconds. Before
 * expanding we probe the rule moved forward by whole 400-year Gregorian cycles (same weekdays,
 * same leap years) to just below that year, which bounds the search to at most this many years.
 */
export const PROBE_LAST_YEAR = 9999 - 100;
/** Hard cap on rule instances scanned in one call (protects against e.g. SECONDLY rules from years ago). */
export const MAX_RECURRENCE_SCAN = 500_000;

/** What to do with a generated instance whose local time does not exist (spring-forward gap). */
export type NonexistentTimePolicy = 'shift-forward' | 'skip';

export interface ExpandOptions {
  /** Only instants after this one (exclusive unless `inclusive`). */
  after?: Date;
  /** Only instants before this one (exclusive unless `inclusive`). */
  before?: Date;
  /** Make `after` and `before` inclusive (like rrule's `between(…, inc)`). */
  inclusive?: boolean;
  /** Maximum number of instants returned; default {@link DEFAULT_RECURRENCE_LIMIT}. */
  limit?: number;
  /** IANA zone for a floating DTSTART (no TZID, no Z); default 'UTC'. */
  floatingZone?: string;
  /**
   * Gap handling for generated instances; default 'shift-forward' (RFC 5545 §3.3.5 reading:
   * the offset before the gap, i.e. moved forward by the gap). 'skip' follows RFC 5545
   * §3.3.10, which says such instances "MUST be ignored and MUST NOT be counted".
   */
  nonexistent?: NonexistentTimePolicy;
  /**
   * Start the walk near `after` instead of at DTSTART when that gives the same set (default
   * true). Off only in tests, to compare with the plain walk.
   */
  skipAhead?: boolean;
}

/** A local calendar date and time with no zone attached. */
export interface WallClock {
  year: number;
  month: number;
  day: number;
  hour: number;
  minute: number;
  second: number;
}

/** Parsed form of the recurrence text, for forms that need to show it again. */
export interface ParsedRecurrence {
  /** Local (wall-clock) start as written in DTSTART. */
  start: WallClock;
  /** `YYYY-MM-DDTHH:mm:ss` rendering of {@link start} (date only for DATE values). */
  startLocal: string;
  /** DTSTART;VALUE=DATE — occurrences are whole days. */
  dateOnly: boolean;
  /** 'zoned' = TZID, 'utc' = trailing Z, 'floating' = neither (RFC 5545 §3.3.5 forms #3, #2, #1). */
  form: 'zoned' | 'utc' | 'floating';
  /** Canonical IANA zone id for 'zoned', 'UTC' for 'utc', null for floating. */
  tzid: string | null;
  /** The RRULE value (without the `RRULE:` prefix), normalised to upper case. */
  rrule: string;
  freq: keyof typeof FREQ_NAMES;
  count: number | null;
  until: UntilValue | null;
}

/** UNTIL as written: DATE, local DATE-TIME, or UTC DATE-TIME (RFC 5545 §3.3.10). */
export type UntilValue = { kind: 'date'; wallMs: number } | { kind: 'local'; wallMs: number } | { kind: 'utc'; instantMs: number };

export const FREQ_NAMES = {
  YEARLY: Frequency.YEARLY,
  MONTHLY: Frequency.MONTHLY,
  WEEKLY: Frequency.WEEKLY,
  DAILY: Frequency.DAILY,
  HOURLY: Frequency.HOURLY,
  MINUTELY: Frequency.MINUTELY,
  SECONDLY: Frequency.SECONDLY,
} as const;

// rrule numbers weekdays Monday = 0 … Sunday = 6.
export const WEEKDAYS: Record<string, number> = { MO: 0, TU: 1, WE: 2, TH: 3, FR: 4, SA: 5, SU: 6 };

/** A parsed rule: what forms see plus what rrule needs. */
export interface Internal {
  parsed: ParsedRecurrence;
  options: Partial<RRuleOptions>;
  startWallMs: number;
}

/** Which form field a recurrence problem belongs to: the first occurrence (DTSTART) or the rule (RRULE). */
export type RecurrencePart = 'start' | 'rule';

/** A recurrence the parser refuses, with the part at fault so callers need not read the wording. */
export class RecurrenceError extends Error {
  constructor(
    message: string,
    readonly part: RecurrencePart,
  ) {
    super(`recurrence: ${message}`);
    this.name = 'RecurrenceError';
  }
}

export function fail(message: string, part: RecurrencePart = 'rule'): never {
  throw new RecurrenceError(message, part);
}

/** A wall-clock time written as if it were UTC, in ms (the "floating" time rrule walks in). */
export function wallToMs(w: WallClock): number {
  return Date.UTC(w.year, w.month - 1, w.day, w.hour, w.minute, w.second);
}
