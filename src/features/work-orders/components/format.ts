import { DateTime } from 'luxon';

/** Dates in the shop's own time zone, the way people at the machine read them. */
export function formatWhen(iso: string | null, timeZone: string, withTime = true): string {
  if (!iso) return '—';
  return new Intl.DateTimeFormat('en-GB', { timeZone, dateStyle: 'medium', ...(withTime ? { timeStyle: 'short' } : {}) }).format(new Date(iso));
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

export const inputClass = 'block w-full min-h-touch rounded border border-steel-400 bg-white px-3 py-2 text-base';

/** An instant as "YYYY-MM-DDTHH:mm" in the shop's zone, for a datetime-local field. */
export function toShopLocal(iso: string | null, timeZone: string): string {
  return iso ? DateTime.fromISO(iso).setZone(timeZone).toFormat("yyyy-MM-dd'T'HH:mm") : '';
}

/** A datetime-local value read in the shop's zone (not the browser's) as an ISO instant, or null. */
export function fromShopLocal(local: string, timeZone: string): string | null {
  return local ? DateTime.fromISO(local, { zone: timeZone }).toUTC().toISO() : null;
}
