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
