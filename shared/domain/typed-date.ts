/**
 * Dates typed by hand, read the way the shop writes them.
 *
 * The order of day, month and year comes from the locale's short date pattern (CLDR, Unicode
 * TR35 "Dates", as exposed by `Intl.DateTimeFormat#formatToParts`): en-US writes 11/01/2026 for
 * 1 November, en-GB writes 01/11/2026. The ISO 8601 calendar date (2026-11-01) is accepted in
 * every locale, so a pasted value or a value from a picker always reads the same.
 * Two-digit years are refused: "26" could be 1926 or 2026 and a safety record must not guess.
 */

export type DateOrder = ('day' | 'month' | 'year')[];

const orders = new Map<string, DateOrder>();

/** The order the locale writes numeric dates in, e.g. ['month', 'day', 'year'] for en-US. */
export function dateOrder(locale: string): DateOrder {
  const known = orders.get(locale);
  if (known) return known;
  const parts = new Intl.DateTimeFormat(locale, { year: 'numeric', month: '2-digit', day: '2-digit', timeZone: 'UTC' }).formatToParts(Date.UTC(2026, 10, 23));
  const order = parts.map((p) => p.type).filter((t): t is 'day' | 'month' | 'year' => t === 'day' || t === 'month' || t === 'year');
  orders.set(locale, order);
  return order;
}

/** How the locale's numeric date looks, for a placeholder: "MM/DD/YYYY". */
export function datePattern(locale: string): string {
  const sep =
    new Intl.DateTimeFormat(locale, { year: 'numeric', month: '2-digit', day: '2-digit', timeZone: 'UTC' })
      .formatToParts(Date.UTC(2026, 10, 23))
      .find((p) => p.type === 'literal')?.value ?? '/';
  return dateOrder(locale)
    .map((t) => (t === 'day' ? 'DD' : t === 'month' ? 'MM' : 'YYYY'))
    .join(sep.trim() || '/');
}

/** A YYYY-MM-DD date written in the locale's numeric form: 2026-11-01 → "11/01/2026" (en-US). */
export function formatTypedDate(iso: string, locale: string): string {
  const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(iso);
  if (!m) return iso;
  const values = { year: m[1], month: m[2], day: m[3] };
  const sep = datePattern(locale).replace(/[DMY]/g, '')[0] ?? '/';
  return dateOrder(locale)
    .map((t) => values[t])
    .join(sep);
}

const isRealDate = (y: number, m: number, d: number) => {
  const dt = new Date(Date.UTC(y, m - 1, d));
  return dt.getUTCFullYear() === y && dt.getUTCMonth() === m - 1 && dt.getUTCDate() === d;
};

/**
 * Reads a typed date as YYYY-MM-DD. Returns null for an empty entry, and `{ error }` for one
 * that is not a whole, real date (a two-digit year, 02/30/2026, letters).
 */
export function parseTypedDate(text: string, locale: string): string | null | { error: string } {
  const s = text.trim();
  if (!s) return null;
  const pattern = datePattern(locale);
  const wrong = { error: `Write the date as ${pattern} or YYYY-MM-DD` };
  let y: number, m: number, d: number;
  const iso = /^(\d{4})-(\d{1,2})-(\d{1,2})$/.exec(s);
  if (iso) [y, m, d] = [Number(iso[1]), Number(iso[2]), Number(iso[3])];
  else {
    const pieces = s.split(/\s*[/.\-\s]\s*/);
    if (pieces.length !== 3 || pieces.some((p) => !/^\d{1,4}$/.test(p))) return wrong;
    const order = dateOrder(locale);
    const at = (t: 'day' | 'month' | 'year') => pieces[order.indexOf(t)];
    if (at('year').length !== 4) return { error: `Write the year in full (four digits): ${pattern}` };
    if (at('day').length > 2 || at('month').length > 2) return wrong;
    [y, m, d] = [Number(at('year')), Number(at('month')), Number(at('day'))];
  }
  if (y < 1900 || y > 2999 || !isRealDate(y, m, d)) return { error: `${s} is not a date on the calendar (${pattern})` };
  return `${String(y).padStart(4, '0')}-${String(m).padStart(2, '0')}-${String(d).padStart(2, '0')}`;
}
