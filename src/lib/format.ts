/**
 * One way to show time everywhere: the shop's own clock (its IANA zone), day-month-year,
 * 24-hour — a night-shift record reads the same on every device, whatever zone the viewer is in.
 */
export function formatWhen(iso: string | Date | null | undefined, timeZone: string, withTime = true): string {
  if (!iso) return '—';
  return new Intl.DateTimeFormat('en-GB', {
    timeZone,
    day: 'numeric',
    month: 'short',
    year: 'numeric',
    ...(withTime ? { hour: '2-digit', minute: '2-digit', hourCycle: 'h23' } : {}),
  }).format(new Date(iso));
}

/** Short axis labels for charts: "3 Dec". */
export function formatDay(iso: string | Date, timeZone: string): string {
  return new Intl.DateTimeFormat('en-GB', { timeZone, day: 'numeric', month: 'short' }).format(new Date(iso));
}

/** "in 3 days", "2 days ago" … relative to now, in whole units. */
export function relative(iso: string | null): string {
  if (!iso) return '';
  const diff = new Date(iso).getTime() - Date.now();
  const abs = Math.abs(diff);
  const rtf = new Intl.RelativeTimeFormat('en', { numeric: 'auto' });
  if (abs < 3_600_000) return rtf.format(Math.round(diff / 60_000), 'minute');
  if (abs < 86_400_000) return rtf.format(Math.round(diff / 3_600_000), 'hour');
  return rtf.format(Math.round(diff / 86_400_000), 'day');
}

/** 12345.6 → "12,345.6": counters are read at a glance. */
export const formatNumber = (n: number, maxFractionDigits = 1) => new Intl.NumberFormat('en-GB', { maximumFractionDigits: maxFractionDigits }).format(n);

// The signed-in shop's zone, set once by the app layout, for formatters made at module level.
let shopTimeZone: string | undefined;
export function setShopTimeZone(timeZone: string) {
  shopTimeZone = timeZone;
}

/** Today's date (YYYY-MM-DD) on the shop's clock: for a few hours a day the UTC date is another day. */
export function shopToday(): string {
  // en-CA writes dates as YYYY-MM-DD; Intl keeps luxon out of every page's first load.
  return new Intl.DateTimeFormat('en-CA', { timeZone: shopTimeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).format(new Date());
}

/** Like `new Intl.DateTimeFormat`, but always on the shop's clock (read when formatting). */
export function shopFormatter(options: Intl.DateTimeFormatOptions) {
  return {
    format: (value: Date | number | string) =>
      new Intl.DateTimeFormat('en-GB', { ...options, ...(options.timeStyle ? { hourCycle: 'h23' } : {}), timeZone: shopTimeZone }).format(new Date(value)),
  };
}
