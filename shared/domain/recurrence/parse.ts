/**
 * Strict parser of RFC 5545 recurrence text: one DTSTART line and one RRULE line (§3.1 content
 * lines, §3.3.4/§3.3.5 DATE and DATE-TIME, §3.3.10 RECUR with its MUST rules).
 */
import { Weekday, type Options as RRuleOptions } from '../rrule';
import { FREQ_NAMES, WEEKDAYS, fail, wallToMs, type Internal, type ParsedRecurrence, type UntilValue, type WallClock } from './types';
import { canonicalZone } from './zone';

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
function parseDateTimeValue(value: string, what: 'DTSTART' | 'UNTIL'): DateTimeValue {
  const part = what === 'DTSTART' ? 'start' : 'rule';
  const m = /^(\d{4})(\d{2})(\d{2})(?:T(\d{2})(\d{2})(\d{2})(Z)?)?$/i.exec(value);
  if (!m) {
    if (/[+-]\d{4}$/.test(value)) {
      // RFC 5545 §3.3.5: "The form of date and time with UTC offset MUST NOT be used."
      fail(`${what} "${value}" uses a UTC offset, which RFC 5545 does not allow; use TZID or a trailing Z`, part);
    }
    fail(`${what} "${value}" is not an RFC 5545 DATE (YYYYMMDD) or DATE-TIME (YYYYMMDDTHHMMSS[Z])`, part);
  }
  const year = Number(m[1]);
  const month = Number(m[2]);
  const day = Number(m[3]);
  const dateOnly = m[4] === undefined;
  const hour = dateOnly ? 0 : Number(m[4]);
  const minute = dateOnly ? 0 : Number(m[5]);
  let second = dateOnly ? 0 : Number(m[6]);
  if (month < 1 || month > 12) fail(`${what} "${value}" has month ${month}; months are 01-12`, part);
  if (day < 1 || day > daysInMonth(year, month)) fail(`${what} "${value}" is not a calendar date`, part);
  if (hour > 23 || minute > 59 || second > 60) fail(`${what} "${value}" is not a valid time of day`, part);
  // RFC 5545 §3.3.5: implementations without leap seconds treat second 60 as 59.
  if (second === 60) second = 59;
  return { wall: { year, month, day, hour, minute, second }, dateOnly, utc: m[7] !== undefined };
}

function pad(n: number, width = 2): string {
  return String(n).padStart(width, '0');
}

function formatWallIso(w: WallClock, dateOnly: boolean): string {
  const date = `${pad(w.year, 4)}-${pad(w.month)}-${pad(w.day)}`;
  return dateOnly ? date : `${date}T${pad(w.hour)}:${pad(w.minute)}:${pad(w.second)}`;
}

export function formatWallIcal(w: WallClock, dateOnly: boolean): string {
  const date = `${pad(w.year, 4)}${pad(w.month)}${pad(w.day)}`;
  return dateOnly ? date : `${date}T${pad(w.hour)}${pad(w.minute)}${pad(w.second)}`;
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

export function parseInternal(ical: string): Internal {
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
