/**
 * Meter arithmetic: which readings may follow which, and how far a meter advanced between
 * two moments when it was reset on the way. House rules (no published source): a count or
 * running-time meter only goes up, except at a reading marked as a reset, from which it
 * counts again from zero; condition readings (pressure drop, temperature) go both ways.
 * Pure: no I/O; runs in the browser too.
 */
import type { MeterKind } from '../schemas/machines';
import { formatDateTime, formatNumber, type ShopClock } from '../locale';

export interface TimedReading {
  at: Date;
  value: number;
  isReset: boolean;
}

/** A reading's value in a message: grouped in the shop's locale, up to three decimals (large counters are read at a glance). */
export const readingValue = (value: number, locale: string) => formatNumber(value, locale, { max: 3 });

/** Counts and hours only grow; condition readings move both ways. */
export const isCumulative = (kind: MeterKind) => kind !== 'condition';

/**
 * Why `next` may not follow `prev` on a meter of `kind`, or null when it may, worded on the shop's
 * clock and in its locale (the screens show readings so; a UTC time beside them reads as another reading).
 * A cumulative meter refuses a lower value unless `next` is a reset; a negative count or
 * time is refused always (a reset starts from zero, it does not go below it).
 */
export function readingOrderProblem(kind: MeterKind, prev: TimedReading | null, next: TimedReading, unit: string, shop: ShopClock): string | null {
  if (!Number.isFinite(next.value)) return 'The reading is not a number';
  if (!isCumulative(kind)) return null;
  if (next.value < 0) return `A ${kind === 'count' ? 'count' : 'running time'} cannot be negative (${readingValue(next.value, shop.locale)} ${unit})`;
  if (prev && !next.isReset && next.value < prev.value) {
    return `${readingValue(next.value, shop.locale)} ${unit} is lower than the reading before it (${readingValue(prev.value, shop.locale)} ${unit} on ${formatDateTime(prev.at, shop)}); record it as a reset if the counter started again from zero`;
  }
  return null;
}

/**
 * How far a cumulative meter advanced from `startValue` through `readings` (sorted by time,
 * all after the start). A reset reading contributes its own value, since the counter
 * started again from zero; otherwise each reading adds its difference to the previous one.
 */
export function advanceSince(startValue: number, readings: readonly TimedReading[]): number {
  let total = 0;
  let prev = startValue;
  for (const r of readings) {
    total += r.isReset ? r.value : Math.max(0, r.value - prev);
    prev = r.value;
  }
  return total;
}

/** Picks at most `max` points spread evenly over a long series so a chart stays light; keeps the last point. */
export function thinSeries<T>(points: readonly T[], max: number): T[] {
  if (points.length <= max || max < 2) return [...points];
  const step = (points.length - 1) / (max - 1);
  const out: T[] = [];
  for (let i = 0; i < max; i++) out.push(points[Math.round(i * step)]);
  return out;
}
