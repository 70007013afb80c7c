import { clock } from './clock';

/**
 * The one rule for showing times and numbers, on screens, in mail and in PDFs alike.
 *
 * - Times are read on the shop's clock (its IANA zone), never the viewer's or the server's: a
 *   night-shift record reads the same on every device and in every message.
 * - Dates are day, month name, year ("5 Dec 2026"), times 24-hour ("14:30"): an order nobody
 *   misreads, whatever country the people are from (a numeric 05/12 is read two ways).
 * - Numbers, and the month names, follow the shop's locale (grouping "12,345.6"), not the
 *   viewer's browser: a count on a screen matches the same count in a mail.
 *
 * Written on Intl alone, so that every page can format without loading a date library: the wall
 * clock comes from Intl.DateTimeFormat in the shop's zone, and the fixed shapes are put together
 * here. The texts are those of luxon's toFormat('d LLL yyyy, HH:mm') (stand-alone month and
 * weekday names from the locale, digits in the locale's numbering system), which
 * tests/domain/locale.test.ts holds them to. Converting datetime-local field values, which needs
 * a zone's offset at a wall-clock time, lives in ./locale-input.
 */
export const DEFAULT_SHOP_LOCALE = 'en-US';

/** Where a moment is shown: the shop's zone and locale. */
export type ShopClock = { timeZone: string; locale: string };

/** The shop's locale; one rule for every shop until a shop can choose its own. */
export function shopLocale(): string {
  return DEFAULT_SHOP_LOCALE;
}

export type Instant = string | Date | number;

// Kept reachable from here for the server and tests; the client imports ./locale-input directly
// where it needs it, so that pages without such a field never load luxon.
export { fromShopLocal, isTimeZone, toShopLocal } from './locale-input';

const INVALID = 'Invalid DateTime';
const PLAIN_DATE = /^\d{4}-\d{2}-\d{2}$/;

/** A wall-clock reading: month 1–12, weekday 0 (Monday) – 6. */
type Wall = { year: number; month: number; day: number; hour: number; minute: number; second: number; weekday: number };

// Building an Intl.DateTimeFormat costs far more than using one, and a table formats hundreds of cells.
const wallFormats = new Map<string, Intl.DateTimeFormat>();

function wallFormat(timeZone: string): Intl.DateTimeFormat {
  let f = wallFormats.get(timeZone);
  if (!f) {
    f = new Intl.DateTimeFormat('en-US', {
      timeZone,
      calendar: 'gregory',
      numberingSystem: 'latn',
      hourCycle: 'h23',
      era: 'short',
      year: 'numeric',
      month: 'numeric',
      day: 'numeric',
      hour: 'numeric',
      minute: 'numeric',
      second: 'numeric',
    });
    wallFormats.set(timeZone, f);
  }
  return f;
}

function instantMs(at: Instant): number {
  if (at instanceof Date) return at.getTime();
  if (typeof at === 'number') return at;
  // A bare date is midnight on the local clock, as for a date-time without an offset.
  return Date.parse(PLAIN_DATE.test(at) ? `${at}T00:00` : at);
}

function weekdayOf(year: number, month: number, day: number): number {
  return (new Date(Date.UTC(year, month - 1, day)).getUTCDay() + 6) % 7;
}

/** The wall clock Intl reads for `ms` in the zone, or null for a zone this runtime does not know. */
function exactWall(ms: number, timeZone: string): Wall | null {
  let parts: Intl.DateTimeFormatPart[];
  try {
    parts = wallFormat(timeZone).formatToParts(ms);
  } catch {
    return null; // RangeError: a zone this runtime does not know
  }
  const w = { year: 0, month: 0, day: 0, hour: 0, minute: 0, second: 0, weekday: 0 };
  let bc = false;
  for (const p of parts) {
    if (p.type === 'era') bc = p.value.startsWith('B');
    else if (p.type in w) w[p.type as keyof Wall] = Number(p.value);
  }
  if (bc) w.year = 1 - w.year;
  w.weekday = weekdayOf(w.year, w.month, w.day);
  return w;
}

const HOUR_MS = 3_600_000;
const MAX_HOURS_PER_ZONE = 200_000;
const wholeSecond = (ms: number) => ms - (((ms % 1000) + 1000) % 1000);

/** The zone's offset from UTC in ms at `ms`, as Intl gives it (to the second). */
function exactOffset(ms: number, timeZone: string): number | null {
  const w = exactWall(ms, timeZone);
  if (!w) return null;
  const d = new Date(0);
  d.setUTCFullYear(w.year, w.month - 1, w.day); // setUTCFullYear, unlike Date.UTC, keeps years 0–99
  d.setUTCHours(w.hour, w.minute, w.second, 0);
  return d.getTime() - wholeSecond(ms);
}

// Offsets remembered per zone and UTC hour: formatToParts costs several times the rest of a
// format, and the due pass formats hundreds of thousands of instants. An hour whose start and end
// have the same offset holds no change of offset (no zone changes twice within an hour); an hour
// with a change is never remembered and is read from Intl each time, so answers stay Intl's.
const hourOffsets = new Map<string, Map<number, number>>();

function offsetInHour(ms: number, timeZone: string): number | null {
  let hours = hourOffsets.get(timeZone);
  const hour = Math.floor(ms / HOUR_MS);
  const known = hours?.get(hour);
  if (known !== undefined) return known;
  const start = exactOffset(hour * HOUR_MS, timeZone);
  if (start === null || start !== exactOffset(hour * HOUR_MS + HOUR_MS - 1, timeZone)) return null;
  if (!hours) hourOffsets.set(timeZone, (hours = new Map()));
  if (hours.size >= MAX_HOURS_PER_ZONE) hours.clear();
  hours.set(hour, start);
  return start;
}

/** The shop's wall clock at `at`, or null for an invalid instant or an unknown zone. */
function wallAt(at: Instant, timeZone: string): Wall | null {
  const ms = instantMs(at);
  if (!Number.isFinite(ms) || Math.abs(ms) > 8.64e15) return null;
  const offset = offsetInHour(ms, timeZone);
  const local = offset === null ? null : new Date(wholeSecond(ms) + offset);
  if (!local || Number.isNaN(local.getTime())) return exactWall(ms, timeZone);
  return {
    year: local.getUTCFullYear(),
    month: local.getUTCMonth() + 1,
    day: local.getUTCDate(),
    hour: local.getUTCHours(),
    minute: local.getUTCMinutes(),
    second: local.getUTCSeconds(),
    weekday: (local.getUTCDay() + 6) % 7,
  };
}

function plainDay(ymd: string): Wall | null {
  const [year, month, day] = ymd.split('-').map(Number);
  const d = new Date(Date.UTC(year, month - 1, day));
  if (d.getUTCMonth() !== month - 1 || d.getUTCDate() !== day) return null;
  return { year, month, day, hour: 0, minute: 0, second: 0, weekday: weekdayOf(year, month, day) };
}

type Names = { months: string[]; weekdays: string[]; digits: (n: number, width: number) => string };
const namesByLocale = new Map<string, Names>();

/** Stand-alone abbreviated month and weekday names (luxon's LLL, ccc) and digits, per locale. */
function namesFor(locale: string): Names {
  let names = namesByLocale.get(locale);
  if (names) return names;
  const pick = (opts: Intl.DateTimeFormatOptions, field: 'month' | 'weekday', date: Date) => {
    // Gregorian, as the day and year beside it (a locale whose own calendar differs would name another month).
    const f = new Intl.DateTimeFormat(locale, { ...opts, calendar: 'gregory', timeZone: 'UTC' });
    return f.formatToParts(date).find((p) => p.type === field)?.value ?? f.format(date);
  };
  const months = Array.from({ length: 12 }, (_, i) => pick({ month: 'short' }, 'month', new Date(Date.UTC(2016, i, 1))));
  // 14 Nov 2016 was a Monday.
  const weekdays = Array.from({ length: 7 }, (_, i) => pick({ weekday: 'short' }, 'weekday', new Date(Date.UTC(2016, 10, 14 + i))));
  const latn = new Intl.DateTimeFormat(locale).resolvedOptions().numberingSystem === 'latn';
  const padded = new Map<number, Intl.NumberFormat>();
  const digits = (n: number, width: number): string => {
    if (latn) return n < 0 ? `-${String(-n).padStart(width, '0')}` : String(n).padStart(width, '0');
    let f = padded.get(width);
    if (!f) {
      f = new Intl.NumberFormat(locale, { useGrouping: false, minimumIntegerDigits: Math.max(width, 1) });
      padded.set(width, f);
    }
    return f.format(n);
  };
  names = { months, weekdays, digits };
  namesByLocale.set(locale, names);
  return names;
}

function dayText(w: Wall, n: Names, withYear: boolean): string {
  const d = `${n.digits(w.day, 1)} ${n.months[w.month - 1]}`;
  return withYear ? `${d} ${n.digits(w.year, 4)}` : d;
}

function clockText(w: Wall, n: Names, seconds: boolean): string {
  const hm = `${n.digits(w.hour, 2)}:${n.digits(w.minute, 2)}`;
  return seconds ? `${hm}:${n.digits(w.second, 2)}` : hm;
}

/** "5 Dec 2026". A plain calendar date (YYYY-MM-DD) is a day already and is not moved through a zone. */
export function formatDate(at: Instant | null | undefined, shop: ShopClock): string {
  if (at === null || at === undefined || at === '') return '—';
  const w = typeof at === 'string' && PLAIN_DATE.test(at) ? plainDay(at) : wallAt(at, shop.timeZone);
  return w ? dayText(w, namesFor(shop.locale), true) : INVALID;
}

/** "5 Dec 2026, 14:30"; with `weekday`, "Sat 5 Dec 2026, 14:30"; with `seconds`, "…, 14:30:05". */
export function formatDateTime(at: Instant | null | undefined, shop: ShopClock, opts: { weekday?: boolean; seconds?: boolean } = {}): string {
  if (at === null || at === undefined || at === '') return '—';
  const w = wallAt(at, shop.timeZone);
  if (!w) return INVALID;
  const n = namesFor(shop.locale);
  return `${opts.weekday ? `${n.weekdays[w.weekday]} ` : ''}${dayText(w, n, true)}, ${clockText(w, n, opts.seconds ?? false)}`;
}

/** "14:30". */
export function formatTime(at: Instant | null | undefined, shop: ShopClock): string {
  if (at === null || at === undefined || at === '') return '—';
  const w = wallAt(at, shop.timeZone);
  return w ? clockText(w, namesFor(shop.locale), false) : INVALID;
}

/** "5 Dec": short chart labels. */
export function formatDay(at: Instant, shop: ShopClock): string {
  const w = wallAt(at, shop.timeZone);
  return w ? dayText(w, namesFor(shop.locale), false) : INVALID;
}

const pad = (n: number, width: number) => String(n).padStart(width, '0');

/** Today's date (YYYY-MM-DD) on the shop's clock: for a few hours a day the UTC date is another day. */
export function todayIn(timeZone: string): string {
  const w = wallAt(clock.ms(), timeZone);
  if (!w) return ''; // an unknown zone has no today
  return `${pad(w.year, 4)}-${pad(w.month, 2)}-${pad(w.day, 2)}`;
}

/** "in 3 days", "2 days ago" … relative to now, in whole units, in the shop's language. */
export function formatRelative(iso: string | null | undefined, locale: string): string {
  if (!iso) return '';
  const diff = new Date(iso).getTime() - clock.ms();
  const abs = Math.abs(diff);
  const rtf = new Intl.RelativeTimeFormat(locale, { numeric: 'auto' });
  if (abs < 3_600_000) return rtf.format(Math.round(diff / 60_000), 'minute');
  if (abs < 86_400_000) return rtf.format(Math.round(diff / 3_600_000), 'hour');
  return rtf.format(Math.round(diff / 86_400_000), 'day');
}

export type NumberStyle = {
  /** Most digits after the point (default 1). */
  max?: number;
  /** Fewest digits after the point (default 0). */
  min?: number;
  /** "+3" / "−2": for changes. */
  signed?: boolean;
};

// Number formats are costly to build and a table formats hundreds of cells: one per style.
const numberFormats = new Map<string, Intl.NumberFormat>();

/** 12345.6 → "12,345.6" in the shop's locale: counters are read at a glance. */
export function formatNumber(n: number, locale: string, { max = 1, min = 0, signed = false }: NumberStyle = {}): string {
  const key = `${locale}|${max}|${min}|${signed}`;
  let f = numberFormats.get(key);
  if (!f) {
    f = new Intl.NumberFormat(locale, { maximumFractionDigits: Math.max(max, min), minimumFractionDigits: min, signDisplay: signed ? 'always' : 'auto' });
    numberFormats.set(key, f);
  }
  return f.format(n);
}

/** With the shop's currency when its settings name one; otherwise a bare amount with two decimals that the caller labels as a cost. */
export function formatMoney(n: number, locale: string, currency: string | null = null): string {
  if (currency) {
    try {
      return new Intl.NumberFormat(locale, { style: 'currency', currency }).format(n);
    } catch {
      // An unknown currency code: fall back to the bare amount.
    }
  }
  return formatNumber(n, locale, { min: 2, max: 2 });
}
