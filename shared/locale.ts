import { DateTime, Info } from 'luxon';
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
 */
export const DEFAULT_SHOP_LOCALE = 'en-US';

/** Where a moment is shown: the shop's zone and locale. */
export type ShopClock = { timeZone: string; locale: string };

/** The shop's locale; one rule for every shop until a shop can choose its own. */
export function shopLocale(): string {
  return DEFAULT_SHOP_LOCALE;
}

export type Instant = string | Date | number;

/** Whether `zone` names a time zone this runtime knows ("Europe/Berlin" yes, "Mars/Olympus" no). */
export const isTimeZone = (zone: string): boolean => Info.isValidIANAZone(zone);

function inShop(at: Instant, { timeZone, locale }: ShopClock): DateTime {
  const dt = at instanceof Date ? DateTime.fromJSDate(at) : typeof at === 'number' ? DateTime.fromMillis(at) : DateTime.fromISO(at);
  return dt.setZone(timeZone).setLocale(locale);
}

const PLAIN_DATE = /^\d{4}-\d{2}-\d{2}$/;

/** "5 Dec 2026". A plain calendar date (YYYY-MM-DD) is a day already and is not moved through a zone. */
export function formatDate(at: Instant | null | undefined, shop: ShopClock): string {
  if (at === null || at === undefined || at === '') return '—';
  if (typeof at === 'string' && PLAIN_DATE.test(at)) return DateTime.fromISO(at, { zone: 'UTC' }).setLocale(shop.locale).toFormat('d LLL yyyy');
  return inShop(at, shop).toFormat('d LLL yyyy');
}

/** "5 Dec 2026, 14:30"; with `weekday`, "Sat 5 Dec 2026, 14:30"; with `seconds`, "…, 14:30:05". */
export function formatDateTime(at: Instant | null | undefined, shop: ShopClock, opts: { weekday?: boolean; seconds?: boolean } = {}): string {
  if (at === null || at === undefined || at === '') return '—';
  return inShop(at, shop).toFormat(`${opts.weekday ? 'ccc ' : ''}d LLL yyyy, ${opts.seconds ? 'HH:mm:ss' : 'HH:mm'}`);
}

/** "14:30". */
export function formatTime(at: Instant | null | undefined, shop: ShopClock): string {
  if (at === null || at === undefined || at === '') return '—';
  return inShop(at, shop).toFormat('HH:mm');
}

/** "5 Dec": short chart labels. */
export function formatDay(at: Instant, shop: ShopClock): string {
  return inShop(at, shop).toFormat('d LLL');
}

/** Today's date (YYYY-MM-DD) on the shop's clock: for a few hours a day the UTC date is another day. */
export function todayIn(timeZone: string): string {
  return DateTime.fromMillis(clock.ms(), { zone: timeZone }).toISODate() as string;
}

/** An instant as "YYYY-MM-DDTHH:mm" in the shop's zone, for a datetime-local field. */
export function toShopLocal(iso: string | null, timeZone: string): string {
  return iso ? DateTime.fromISO(iso).setZone(timeZone).toFormat("yyyy-MM-dd'T'HH:mm") : '';
}

/** A datetime-local value read in the shop's zone (not the browser's) as an ISO instant, or null. */
export function fromShopLocal(local: string, timeZone: string): string | null {
  return local ? DateTime.fromISO(local, { zone: timeZone }).toUTC().toISO() : null;
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
