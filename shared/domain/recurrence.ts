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
import { IANAZone } from 'luxon';
import { RRule, Frequency, Weekday, type Options as RRuleOptions } from './rrule';
import { cachedZone } from './zone-offsets';

const MINUTE_MS = 60_000;
const DAY_MS = 86_400_000;
/** Wider than any UTC offset (±14 h) plus any DST gap (≤ 24 h, Pacific/Apia 2011). */
const SLACK_MS = 2 * DAY_MS;
/** Default cap on returned occurrences, so an unbounded rule cannot run away. */
export const DEFAULT_RECURRENCE_LIMIT = 1000;
/**
 * rrule looks for the next instance up to the year 9999 without calling back, so a rule with
 * no instances at all (e.g. FREQ=DAILY;BYMONTH=2;BYMONTHDAY=30) would spin for seconds. Before
 * expanding we probe the rule moved forward by whole 400-year Gregorian cycles (same weekdays,
 * same leap years) to just below that year, which bounds the search to at most this many years.
 */
const PROBE_LAST_YEAR = 9999 - 100;
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
export type UntilValue =
  | { kind: 'date'; wallMs: number }
  | { kind: 'local'; wallMs: number }
  | { kind: 'utc'; instantMs: number };

const FREQ_NAMES = {
  YEARLY: Frequency.YEARLY,
  MONTHLY: Frequency.MONTHLY,
  WEEKLY: Frequency.WEEKLY,
  DAILY: Frequency.DAILY,
  HOURLY: Frequency.HOURLY,
  MINUTELY: Frequency.MINUTELY,
  SECONDLY: Frequency.SECONDLY,
} as const;

// rrule numbers weekdays Monday = 0 … Sunday = 6.
const WEEKDAYS: Record<string, number> = { MO: 0, TU: 1, WE: 2, TH: 3, FR: 4, SA: 5, SU: 6 };

interface Internal {
  parsed: ParsedRecurrence;
  options: Partial<RRuleOptions>;
  startWallMs: number;
}

function fail(message: string): never {
  throw new Error(`recurrence: ${message}`);
}

// ---------------------------------------------------------------------------
// Parsing
// ---------------------------------------------------------------------------

/** RFC 5545 §3.1: a CRLF followed by one space or tab continues the previous line. */
function unfold(text: string): string[] {
  return text
    .replace(/\r\n[ \t]|\n[ \t]|\r[ \t]/g, '')
    .split(/\r\n|\n|\r/)
    .map((l) => l.trim())
    .filter((l) => l.length > 0);
}

interface ContentLine {
  name: string;
  params: Record<string, string>;
  value: string;
}

/** RFC 5545 §3.1 content line: name *(";" param) ":" value; param values may be quoted. */
function parseContentLine(line: string): ContentLine {
  const m = /^([A-Za-z0-9-]+)/.exec(line);
  if (!m) fail(`cannot read line "${line}"`);
  const name = m[1].toUpperCase();
  let i = m[1].length;
  const params: Record<string, string> = {};
  while (i < line.length && line[i] === ';') {
    const eq = line.indexOf('=', i);
    if (eq < 0) fail(`parameter without "=" in line "${line}"`);
    const key = line.slice(i + 1, eq).toUpperCase();
    let j = eq + 1;
    let val: string;
    if (line[j] === '"') {
      const close = line.indexOf('"', j + 1);
      if (close < 0) fail(`unterminated quoted parameter in line "${line}"`);
      val = line.slice(j + 1, close);
      j = close + 1;
    } else {
      let k = j;
      while (k < line.length && line[k] !== ';' && line[k] !== ':') k++;
      val = line.slice(j, k);
      j = k;
    }
    params[key] = val;
    i = j;
  }
  if (line[i] !== ':') fail(`missing ":" in line "${line}"`);
  return { name, params, value: line.slice(i + 1).trim() };
}

function daysInMonth(year: number, month: number): number {
  return new Date(Date.UTC(year, month, 0)).getUTCDate();
}

interface DateTimeValue {
  wall: WallClock;
  dateOnly: boolean;
  utc: boolean;
}

/** RFC 5545 §3.3.4 DATE (YYYYMMDD) and §3.3.5 DATE-TIME (YYYYMMDDTHHMMSS[Z]). */
function parseDateTimeValue(value: string, what: string): DateTimeValue {
  const m = /^(\d{4})(\d{2})(\d{2})(?:T(\d{2})(\d{2})(\d{2})(Z)?)?$/i.exec(value);
  if (!m) {
    if (/[+-]\d{4}$/.test(value)) {
      // RFC 5545 §3.3.5: "The form of date and time with UTC offset MUST NOT be used."
      fail(`${what} "${value}" uses a UTC offset, which RFC 5545 does not allow; use TZID or a trailing Z`);
    }
    fail(`${what} "${value}" is not an RFC 5545 DATE (YYYYMMDD) or DATE-TIME (YYYYMMDDTHHMMSS[Z])`);
  }
  const year = Number(m[1]);
  const month = Number(m[2]);
  const day = Number(m[3]);
  const dateOnly = m[4] === undefined;
  const hour = dateOnly ? 0 : Number(m[4]);
  const minute = dateOnly ? 0 : Number(m[5]);
  let second = dateOnly ? 0 : Number(m[6]);
  if (month < 1 || month > 12) fail(`${what} "${value}" has month ${month}; months are 01-12`);
  if (day < 1 || day > daysInMonth(year, month)) fail(`${what} "${value}" is not a calendar date`);
  if (hour > 23 || minute > 59 || second > 60) fail(`${what} "${value}" is not a valid time of day`);
  // RFC 5545 §3.3.5: implementations without leap seconds treat second 60 as 59.
  if (second === 60) second = 59;
  return { wall: { year, month, day, hour, minute, second }, dateOnly, utc: m[7] !== undefined };
}

function wallToMs(w: WallClock): number {
  return Date.UTC(w.year, w.month - 1, w.day, w.hour, w.minute, w.second);
}

function pad(n: number, width = 2): string {
  return String(n).padStart(width, '0');
}

function formatWallIso(w: WallClock, dateOnly: boolean): string {
  const date = `${pad(w.year, 4)}-${pad(w.month)}-${pad(w.day)}`;
  return dateOnly ? date : `${date}T${pad(w.hour)}:${pad(w.minute)}:${pad(w.second)}`;
}

function formatWallIcal(w: WallClock, dateOnly: boolean): string {
  const date = `${pad(w.year, 4)}${pad(w.month)}${pad(w.day)}`;
  return dateOnly ? date : `${date}T${pad(w.hour)}${pad(w.minute)}${pad(w.second)}`;
}

/**
 * Canonical IANA time-zone id (RFC 5545 §3.2.19 TZID values are IANA ids here), e.g.
 * 'europe/berlin' → 'Europe/Berlin'; throws an Error naming an unknown id.
 */
// Intl zone checks cost tens of microseconds each; ids are few, so remember the good ones.
const canonicalZoneCache = new Map<string, string>();

export function canonicalZone(tzid: string): string {
  const hit = typeof tzid === 'string' ? canonicalZoneCache.get(tzid) : undefined;
  if (hit !== undefined) return hit;
  const id = canonicalZoneUncached(tzid);
  if (canonicalZoneCache.size >= 256) canonicalZoneCache.clear();
  canonicalZoneCache.set(tzid, id);
  return id;
}

function canonicalZoneUncached(tzid: string): string {
  const trimmed = tzid.trim();
  if (!trimmed || !IANAZone.isValidZone(trimmed)) {
    fail(`unknown time zone "${tzid}" (expected an IANA id such as Europe/Berlin)`);
  }
  try {
    return new Intl.DateTimeFormat('en-US', { timeZone: trimmed }).resolvedOptions().timeZone;
  } catch {
    return trimmed;
  }
}

function parseIntList(name: string, value: string, min: number, max: number, allowNegative: boolean): number[] {
  const items = value.split(',');
  return items.map((raw) => {
    if (!/^[+-]?\d{1,3}$/.test(raw)) fail(`${name} value "${raw}" is not an integer`);
    const n = Number(raw);
    const abs = Math.abs(n);
    if ((n < 0 || raw.startsWith('-')) && !allowNegative) fail(`${name} value "${raw}" must not be negative`);
    if (abs < min || abs > max || (allowNegative && n === 0)) {
      fail(`${name} value "${raw}" is out of range (${allowNegative ? `${min}..${max} or -${max}..-${min}` : `${min}..${max}`})`);
    }
    return n;
  });
}

interface RuleParts {
  freq: keyof typeof FREQ_NAMES;
  options: Partial<RRuleOptions>;
  count: number | null;
  untilRaw: string | null;
  normalized: string;
  hasNumericByday: boolean;
}

/** RFC 5545 §3.3.10 RECUR value, checked strictly (rrule's own parser accepts nonsense silently). */
function parseRuleValue(value: string): RuleParts {
  if (!value) fail('RRULE is empty');
  const seen = new Set<string>();
  const options: Partial<RRuleOptions> = {};
  let freq: keyof typeof FREQ_NAMES | null = null;
  let count: number | null = null;
  let untilRaw: string | null = null;
  let hasNumericByday = false;
  const parts = value.split(';').filter((p) => p.length > 0);
  for (const part of parts) {
    const eq = part.indexOf('=');
    if (eq <= 0) fail(`RRULE part "${part}" is not NAME=VALUE`);
    const name = part.slice(0, eq).toUpperCase();
    const val = part.slice(eq + 1).toUpperCase();
    if (seen.has(name)) fail(`RRULE part ${name} appears more than once`);
    seen.add(name);
    if (val === '') fail(`RRULE part ${name} has no value`);
    switch (name) {
      case 'FREQ':
        if (!(val in FREQ_NAMES)) fail(`FREQ "${val}" is not one of ${Object.keys(FREQ_NAMES).join(', ')}`);
        freq = val as keyof typeof FREQ_NAMES;
        break;
      case 'COUNT':
      case 'INTERVAL': {
        if (!/^\d+$/.test(val) || Number(val) < 1) fail(`${name} must be a positive integer, got "${val}"`);
        if (name === 'COUNT') count = Number(val);
        else options.interval = Number(val);
        break;
      }
      case 'UNTIL':
        untilRaw = val;
        break;
      case 'BYSECOND': {
        const list = parseIntList(name, val, 0, 60, false);
        if (list.includes(60)) fail('BYSECOND=60 (leap second) is not supported');
        options.bysecond = list;
        break;
      }
      case 'BYMINUTE':
        options.byminute = parseIntList(name, val, 0, 59, false);
        break;
      case 'BYHOUR':
        options.byhour = parseIntList(name, val, 0, 23, false);
        break;
      case 'BYMONTHDAY':
        options.bymonthday = parseIntList(name, val, 1, 31, true);
        break;
      case 'BYYEARDAY':
        options.byyearday = parseIntList(name, val, 1, 366, true);
        break;
      case 'BYWEEKNO':
        options.byweekno = parseIntList(name, val, 1, 53, true);
        break;
      case 'BYMONTH':
        options.bymonth = parseIntList(name, val, 1, 12, false);
        break;
      case 'BYSETPOS':
        options.bysetpos = parseIntList(name, val, 1, 366, true);
        break;
      case 'BYDAY': {
        options.byweekday = val.split(',').map((d) => {
          const dm = /^([+-]?\d{1,2})?(MO|TU|WE|TH|FR|SA|SU)$/.exec(d);
          if (!dm) fail(`BYDAY value "${d}" is not [+/-n]MO..SU`);
          if (dm[1] === undefined) return new Weekday(WEEKDAYS[dm[2]]);
          const n = Number(dm[1]);
          if (n === 0 || Math.abs(n) > 53) fail(`BYDAY ordinal in "${d}" must be 1..53 or -53..-1`);
          hasNumericByday = true;
          return new Weekday(WEEKDAYS[dm[2]], n);
        });
        break;
      }
      case 'WKST':
        if (!(val in WEEKDAYS)) fail(`WKST "${val}" is not one of MO, TU, WE, TH, FR, SA, SU`);
        options.wkst = WEEKDAYS[val];
        break;
      default:
        fail(`unknown RRULE part "${name}"`);
    }
  }
  if (freq === null) fail('RRULE has no FREQ (RFC 5545 §3.3.10: FREQ is required)');
  if (freq === 'HOURLY' || freq === 'MINUTELY' || freq === 'SECONDLY') {
    // Calendar maintenance repeats at most daily (running hours are meters). Sub-daily rules
    // can also keep rrule searching for a long time without emitting anything.
    fail(`FREQ=${freq} is not supported; calendar schedules repeat at most daily (use BYHOUR for several times a day)`);
  }
  if (count !== null && untilRaw !== null) fail('RRULE has both COUNT and UNTIL (RFC 5545 §3.3.10: they MUST NOT occur together)');
  // RFC 5545 §3.3.10 restrictions ("MUST NOT" in the text and N/A cells of the BYxxx table).
  if (options.byweekno && freq !== 'YEARLY') fail('BYWEEKNO is only allowed with FREQ=YEARLY');
  if (options.byyearday && (freq === 'DAILY' || freq === 'WEEKLY' || freq === 'MONTHLY')) {
    fail(`BYYEARDAY is not allowed with FREQ=${freq}`);
  }
  if (options.bymonthday && freq === 'WEEKLY') fail('BYMONTHDAY is not allowed with FREQ=WEEKLY');
  if (hasNumericByday && freq !== 'MONTHLY' && freq !== 'YEARLY') {
    fail(`BYDAY with an ordinal (e.g. 1FR) is only allowed with FREQ=MONTHLY or YEARLY, not ${freq}`);
  }
  if (hasNumericByday && freq === 'YEARLY' && options.byweekno) fail('BYDAY with an ordinal is not allowed together with BYWEEKNO');
  if (options.bysetpos) {
    const others = ['BYSECOND', 'BYMINUTE', 'BYHOUR', 'BYDAY', 'BYMONTHDAY', 'BYYEARDAY', 'BYWEEKNO', 'BYMONTH'];
    if (!others.some((o) => seen.has(o))) fail('BYSETPOS must be used together with another BYxxx part');
  }
  options.freq = FREQ_NAMES[freq];
  // Keep FREQ first, as RFC 5545 §3.3.10 asks for backward compatibility.
  const normalizedParts = parts.map((p) => {
    const eq = p.indexOf('=');
    return `${p.slice(0, eq).toUpperCase()}=${p.slice(eq + 1).toUpperCase()}`;
  });
  normalizedParts.sort((a, b) => (a.startsWith('FREQ=') ? -1 : b.startsWith('FREQ=') ? 1 : 0));
  return { freq, options, count, untilRaw, normalized: normalizedParts.join(';'), hasNumericByday };
}

function parseInternal(ical: string): Internal {
  if (typeof ical !== 'string' || ical.trim() === '') fail('recurrence text is empty');
  const lines = unfold(ical).map(parseContentLine);
  const dtstarts = lines.filter((l) => l.name === 'DTSTART');
  const rrules = lines.filter((l) => l.name === 'RRULE');
  for (const l of lines) {
    if (l.name === 'DTSTART' || l.name === 'RRULE') continue;
    if (l.name === 'EXDATE' || l.name === 'RDATE' || l.name === 'EXRULE') {
      fail(`${l.name} is not supported; only one DTSTART and one RRULE line`);
    }
    fail(`unexpected line "${l.name}"; only DTSTART and RRULE lines are accepted`);
  }
  if (dtstarts.length === 0) fail('missing DTSTART line');
  if (dtstarts.length > 1) fail('more than one DTSTART line');
  if (rrules.length === 0) fail('missing RRULE line');
  // RFC 5545 §3.8.5.3: the set generated with multiple RRULE properties is undefined.
  if (rrules.length > 1) fail('more than one RRULE line');

  const dt = dtstarts[0];
  const valueType = dt.params.VALUE?.toUpperCase();
  if (valueType && valueType !== 'DATE' && valueType !== 'DATE-TIME') fail(`DTSTART VALUE=${valueType} is not DATE or DATE-TIME`);
  const start = parseDateTimeValue(dt.value, 'DTSTART');
  if (valueType === 'DATE' && !start.dateOnly) fail(`DTSTART;VALUE=DATE needs a date (YYYYMMDD), got "${dt.value}"`);
  if (valueType === 'DATE-TIME' && start.dateOnly) fail(`DTSTART;VALUE=DATE-TIME needs a date-time, got "${dt.value}"`);
  const rawTzid = dt.params.TZID;
  if (rawTzid !== undefined && start.utc) {
    fail('DTSTART has both TZID and a trailing Z (RFC 5545 §3.3.5: TZID MUST NOT be used with UTC time)');
  }
  if (rawTzid !== undefined && start.dateOnly) fail('DTSTART with TZID must be a DATE-TIME, not a DATE');
  const tzid = rawTzid !== undefined ? canonicalZone(rawTzid) : start.utc ? 'UTC' : null;
  const form: ParsedRecurrence['form'] = rawTzid !== undefined ? 'zoned' : start.utc ? 'utc' : 'floating';

  const rule = parseRuleValue(rrules[0].value);
  if (start.dateOnly) {
    // RFC 5545 §3.3.10: BYSECOND/BYMINUTE/BYHOUR "MUST be ignored" with a DATE DTSTART.
    delete rule.options.byhour;
    delete rule.options.byminute;
    delete rule.options.bysecond;
  }

  let until: UntilValue | null = null;
  if (rule.untilRaw !== null) {
    const u = parseDateTimeValue(rule.untilRaw, 'UNTIL');
    // RFC 5545 §3.3.10: "The value of the UNTIL rule part MUST have the same value type as DTSTART."
    if (u.dateOnly !== start.dateOnly) {
      fail(`UNTIL must be a ${start.dateOnly ? 'DATE' : 'DATE-TIME'} because DTSTART is a ${start.dateOnly ? 'DATE' : 'DATE-TIME'}`);
    }
    if (u.dateOnly) until = { kind: 'date', wallMs: wallToMs(u.wall) };
    else if (u.utc) until = { kind: 'utc', instantMs: wallToMs(u.wall) };
    // A local UNTIL is the RFC form for a floating DTSTART; for a zoned one we read it in that zone.
    else until = { kind: 'local', wallMs: wallToMs(u.wall) };
  }

  const startWallMs = wallToMs(start.wall);
  const parsed: ParsedRecurrence = {
    start: start.wall,
    startLocal: formatWallIso(start.wall, start.dateOnly),
    dateOnly: start.dateOnly,
    form,
    tzid,
    rrule: rule.normalized,
    freq: rule.freq,
    count: rule.count,
    until,
  };
  return { parsed, options: rule.options, startWallMs };
}

/** Parses RFC 5545 (§3.8.2.4 DTSTART, §3.8.5.3 RRULE) text; throws an Error naming the problem. */
export function parseRecurrence(ical: string): ParsedRecurrence {
  return parseInternal(ical).parsed;
}

// ---------------------------------------------------------------------------
// Wall clock ↔ instant
// ---------------------------------------------------------------------------

interface ZoneConv {
  /** Offset in minutes at an instant. */
  offsetAt(instantMs: number): number;
  fixed: boolean;
}

// One converter per zone, so its offset cache is shared by every rule in that zone.
const zoneCache = new Map<string, ZoneConv>();

function makeZone(tzid: string): ZoneConv {
  let z = zoneCache.get(tzid);
  if (z === undefined) {
    z = makeZoneUncached(tzid);
    if (zoneCache.size >= 256) zoneCache.clear();
    zoneCache.set(tzid, z);
  }
  return z;
}

function makeZoneUncached(tzid: string): ZoneConv {
  if (tzid === 'UTC' || tzid === 'Etc/UTC') return { offsetAt: () => 0, fixed: true };
  const zone = cachedZone(tzid);
  return { fixed: false, offsetAt: (ms: number) => zone.offset(ms) };
}

/**
 * Instant for a wall-clock time in a zone, per RFC 5545 §3.3.5: an ambiguous time
 * (fall-back) is the first occurrence; a non-existent time (spring-forward gap) is read
 * with the offset before the gap, i.e. shifted forward by the gap. Returns `gap: true`
 * for the latter so callers can reject or skip instead.
 */
function wallToInstant(wallMs: number, zone: ZoneConv): { ms: number; gap: boolean } {
  if (zone.fixed) return { ms: wallMs - zone.offsetAt(wallMs) * MINUTE_MS, gap: false };
  // Probe points on UTC day boundaries, so consecutive daily occurrences share them (cache hits).
  const dayStart = Math.floor(wallMs / DAY_MS) * DAY_MS;
  const before = zone.offsetAt(dayStart - DAY_MS);
  const after = zone.offsetAt(dayStart + 2 * DAY_MS);
  if (before === after) {
    const ms = wallMs - before * MINUTE_MS;
    if (zone.offsetAt(ms) === before) return { ms, gap: false };
  }
  const candidates = new Set([before, after, zone.offsetAt(wallMs)]);
  let best: number | null = null;
  for (const o of candidates) {
    const ms = wallMs - o * MINUTE_MS;
    if (zone.offsetAt(ms) === o && (best === null || ms < best)) best = ms;
  }
  if (best !== null) return { ms: best, gap: false };
  return { ms: wallMs - before * MINUTE_MS, gap: true };
}

function instantToWall(instantMs: number, zone: ZoneConv): number {
  return instantMs + zone.offsetAt(instantMs) * MINUTE_MS;
}

/** Converts a wall-clock time in an IANA zone to an instant (RFC 5545 §3.3.5 rules); reports gaps. */
export function localToInstant(local: WallClock, tzid: string): { instant: Date; nonexistent: boolean } {
  const zone = makeZone(canonicalZone(tzid));
  const r = wallToInstant(wallToMs(local), zone);
  return { instant: new Date(r.ms), nonexistent: r.gap };
}

// ---------------------------------------------------------------------------
// Expansion
// ---------------------------------------------------------------------------

interface Prepared {
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
interface OccurrenceWindow {
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

function prepare(ical: string, floatingZone: string | undefined, policy: NonexistentTimePolicy | undefined): Prepared {
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
    fail(
      `DTSTART ${p.startLocal} does not exist in ${zoneId} (it falls in a daylight-saving gap); choose a time outside the gap`,
    );
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
function skipAheadRule(prep: Prepared, lowWall: number): RRule | null {
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
      base.freq === Frequency.WEEKLY
        ? startDay - ((((new Date(startMs).getUTCDay() + 6) % 7) - ((base.wkst as number | undefined) ?? 0) + 7) % 7)
        : startDay;
    const stride = base.freq === Frequency.WEEKLY ? 7 * interval : interval;
    const k = Math.floor((targetDay - periodStart) / stride);
    if (k < 1) return null;
    newStart = (periodStart + k * stride) * DAY_MS;
  }
  if (newStart <= startMs || newStart > lowWall) return null;
  return new RRule({ ...base, dtstart: new Date(newStart) }, true);
}

interface Visit {
  wallMs: number;
  /** Instant in ms, or null when not converted (far below the range of interest). */
  ms: number | null;
}

/**
 * Walks the recurrence set in wall-clock order, applying COUNT, UNTIL and the gap policy.
 * `lowWall`: below this wall time conversion may be skipped (when it cannot matter).
 * The visitor returns false to stop.
 */
function walk(prep: Prepared, lowWall: number, visit: (v: Visit) => boolean, skipAhead = false, skipTo = lowWall): { skipped: boolean; ended: boolean } {
  const { internal, zone, policy } = prep;
  const skipped = skipAhead ? skipAheadRule(prep, Math.min(skipTo, lowWall)) : null;
  const rule = skipped ?? prep.rule;
  const { count, until } = internal.parsed;
  // Under 'skip' a gap instance is not part of the set, so every instance must be checked.
  const mustConvertAll = policy === 'skip';
  let produced = 0;
  let scanned = 0;
  let stopped = false;
  let visitorStopped = false;
  rule.all((d) => {
    if (stopped) return false;
    scanned++;
    if (scanned > MAX_RECURRENCE_SCAN) {
      fail(`expansion scanned more than ${MAX_RECURRENCE_SCAN} instances; narrow the rule or move DTSTART closer`);
    }
    const wallMs = d.getTime();
    let ms: number | null = null;
    const needConvert = mustConvertAll || wallMs >= lowWall || until?.kind === 'utc';
    if (needConvert) {
      const r = wallToInstant(wallMs, zone);
      if (r.gap && policy === 'skip') return true; // RFC 5545 §3.3.10: ignored and not counted
      ms = r.ms;
    }
    if (until) {
      const within =
        until.kind === 'utc' ? (ms as number) <= until.instantMs : wallMs <= until.wallMs;
      if (!within) {
        // Past UNTIL in wall order; the instant test can only flip back within the slack.
        if (wallMs > (until.kind === 'utc' ? instantToWall(until.instantMs, zone) : until.wallMs) + SLACK_MS) {
          stopped = true;
          return false;
        }
        return true;
      }
    }
    produced++;
    if (count !== null && produced > count) {
      stopped = true;
      return false;
    }
    if (!visit({ wallMs, ms })) {
      stopped = true;
      visitorStopped = true;
      return false;
    }
    return true;
  });
  // `ended`: the rule ran out (UNTIL, COUNT or its last instance) before the visitor stopped it.
  return { skipped: skipped !== null, ended: !visitorStopped };
}

/** Rough length of one FREQ×INTERVAL period, for looking back a few periods. */
function periodMs(prep: Prepared): number {
  const interval = prep.skipBase?.interval ?? 1;
  switch (prep.skipBase?.freq) {
    case Frequency.DAILY:
      return interval * DAY_MS;
    case Frequency.WEEKLY:
      return 7 * interval * DAY_MS;
    default:
      return 31 * interval * DAY_MS;
  }
}

// Rules asked about many times (plans share rule texts) are answered from a window of their
// instants around the last question, instead of a fresh rrule walk per question.
const WINDOW_AFTER_USES = 3;
const WINDOW_SPAN_MS = 500 * DAY_MS;
const WINDOW_MAX_INSTANTS = 2048;

function buildWindow(prep: Prepared, aroundWall: number): OccurrenceWindow {
  const fromWall = aroundWall - WINDOW_SPAN_MS;
  let toWall = aroundWall + WINDOW_SPAN_MS;
  const ms: number[] = [];
  // rrule yields days in order but a day's times as the rule lists them, so the walk goes on a
  // slack past toWall before it can be sure no instant at or before toWall is still to come.
  const { ended } = walk(
    prep,
    fromWall,
    (v) => {
      if (v.wallMs > toWall + SLACK_MS) return false;
      if (v.wallMs < fromWall || v.ms === null) return true;
      if (ms.length >= WINDOW_MAX_INSTANTS && toWall === aroundWall + WINDOW_SPAN_MS) {
        // Dense rule: end the window well before this instant.
        toWall = Math.max(fromWall, v.wallMs - SLACK_MS);
      }
      ms.push(v.ms);
      return true;
    },
    true,
  );
  ms.sort((a, b) => a - b);
  const unique = ms.filter((x, i) => i === 0 || x !== ms[i - 1]);
  return { fromWall, toWall, complete: ended, fromStart: fromWall <= prep.internal.startWallMs, ms: unique };
}

/** The rule's window when it is worth having (built or rebuilt around `aroundWall`), else null. */
function windowFor(prep: Prepared, aroundWall: number, covers: (w: OccurrenceWindow) => boolean): OccurrenceWindow | null {
  // Only rules the walk can start near any time (DAILY, WEEKLY, MONTHLY without COUNT): building a
  // window for the others would mean walking from DTSTART.
  if (prep.skipBase === null) return null;
  prep.uses++;
  if (prep.window && covers(prep.window)) return prep.window;
  if (prep.uses < WINDOW_AFTER_USES || !Number.isFinite(aroundWall)) return null;
  const w = buildWindow(prep, aroundWall);
  prep.window = w;
  return covers(w) ? w : null;
}

/** First index in sorted `xs` whose value is > x, or >= x when `orEqual`. */
function firstAbove(xs: number[], x: number, orEqual: boolean): number {
  let lo = 0;
  let hi = xs.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (orEqual ? xs[mid] >= x : xs[mid] > x) hi = mid;
    else lo = mid + 1;
  }
  return lo;
}

/**
 * expandRecurrence from the window, or null when the window cannot prove the answer complete.
 * Offsets differ by less than SLACK_MS, so an instant after `after` has a wall time above
 * afterWall − SLACK_MS, and one missing beyond toWall has an instant above toWall − SLACK_MS.
 */
function expandFromWindow(prep: Prepared, afterMs: number, afterWall: number, beforeMs: number | null, inclusive: boolean, limit: number): number[] | null {
  const w = windowFor(prep, afterWall, (x) => x.fromWall <= afterWall - SLACK_MS);
  if (w === null) return null;
  const out: number[] = [];
  for (let i = firstAbove(w.ms, afterMs, inclusive); i < w.ms.length && out.length < limit; i++) {
    const ms = w.ms[i];
    if (beforeMs !== null && (inclusive ? ms > beforeMs : ms >= beforeMs)) break;
    out.push(ms);
  }
  if (w.complete) return out;
  const safeUpTo = w.toWall - SLACK_MS;
  if (out.length === limit && out[out.length - 1] < safeUpTo) return out;
  if (beforeMs !== null && beforeMs < safeUpTo) return out;
  return null;
}

/** previousOccurrence from the window, or null when the window cannot prove the answer (see above). */
function previousFromWindow(prep: Prepared, atMs: number, atWall: number, inclusive: boolean): { ms: number | null } | null {
  const w = windowFor(prep, atWall, (x) => x.complete || atMs < x.toWall - SLACK_MS);
  if (w === null) return null;
  const i = firstAbove(w.ms, atMs, !inclusive) - 1;
  const best = i >= 0 ? w.ms[i] : null;
  if (w.fromStart || (best !== null && best > w.fromWall + SLACK_MS)) return { ms: best };
  return null;
}

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
  walk(prep, afterWall - SLACK_MS, ({ wallMs, ms }) => {
    if (wallMs > beforeWall + SLACK_MS || wallMs > cutoffWall) return false;
    if (ms === null) return true;
    if (afterMs !== null && (inclusive ? ms < afterMs : ms <= afterMs)) return true;
    if (beforeMs !== null && (inclusive ? ms > beforeMs : ms >= beforeMs)) return true;
    found.push(ms);
    // Gap shifts can reorder instants slightly; keep going a little past the limit, then sort.
    if (found.length >= limit && cutoffWall === Infinity) cutoffWall = wallMs + SLACK_MS;
    return true;
  }, options.skipAhead ?? true);
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
): { ok: true } | { ok: false; error: string } {
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
    return { ok: false, error: e instanceof Error ? e.message : String(e) };
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
    if (Number.isNaN(input.start.getTime())) fail('start is an invalid Date');
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
    if (!m) fail(`start "${input.start}" is not a local ISO date-time YYYY-MM-DDTHH:mm[:ss] (no offset, no Z)`);
    wall = {
      year: Number(m[1]),
      month: Number(m[2]),
      day: Number(m[3]),
      hour: Number(m[4]),
      minute: Number(m[5]),
      second: m[6] === undefined ? 0 : Number(m[6]),
    };
  } else {
    fail('start must be a Date or a local ISO string');
  }
  const rule = input.rrule.trim().replace(/^RRULE:/i, '');
  const stamp = formatWallIcal(wall, false);
  const dtstart = isUtc ? `DTSTART:${stamp}Z` : `DTSTART;TZID=${tz}:${stamp}`;
  const draft = `${dtstart}\nRRULE:${rule}`;
  const check = validateRecurrence(draft);
  if (!check.ok) throw new Error(check.error);
  // Store the normalised rule (upper case, FREQ first) so equal schedules compare equal.
  return `${dtstart}\nRRULE:${parseRecurrence(draft).rrule}`;
}
