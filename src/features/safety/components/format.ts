/** Dates and times in the shop's time zone, so a night-shift record shows the shop's clock, not the viewer's. */
export function fmtDateTime(iso: string | null | undefined, timeZone: string): string {
  if (!iso) return '—';
  return new Intl.DateTimeFormat('en-GB', {
    timeZone,
    day: '2-digit',
    month: 'short',
    year: 'numeric',
    hour: '2-digit',
    minute: '2-digit',
    hour12: false,
  }).format(new Date(iso));
}
export function fmtTime(iso: string | null | undefined, timeZone: string): string {
  if (!iso) return '—';
  return new Intl.DateTimeFormat('en-GB', { timeZone, hour: '2-digit', minute: '2-digit', hour12: false }).format(new Date(iso));
}
export function fmtDate(isoOrDate: string | null | undefined, timeZone?: string): string {
  if (!isoOrDate) return '—';
  // Plain dates (YYYY-MM-DD) are calendar days already; do not shift them through a zone.
  const d = /^\d{4}-\d{2}-\d{2}$/.test(isoOrDate) ? new Date(`${isoOrDate}T12:00:00Z`) : new Date(isoOrDate);
  return new Intl.DateTimeFormat('en-GB', {
    timeZone: /^\d{4}-\d{2}-\d{2}$/.test(isoOrDate) ? 'UTC' : timeZone,
    day: '2-digit',
    month: 'short',
    year: 'numeric',
  }).format(d);
}
/** Today's calendar date in the shop's zone (YYYY-MM-DD). */
export function todayIn(timeZone: string): string {
  return new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).format(new Date());
}

/** A shade-table band for people: "Light (under 300 A)", "Medium (300–400 A)"; stored labels stay as the table has them. */
export function shadeBandLabel(b: { label: string; fromA: number; toA: number }): string {
  const name = b.label.charAt(0).toUpperCase() + b.label.slice(1);
  return `${name} (${b.fromA === 0 ? `under ${b.toA} A` : `${b.fromA}–${b.toA} A`})`;
}
