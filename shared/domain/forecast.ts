/**
 * Meter forecasting (arc starts, hits, hours, condition readings): the usage rate per calendar day,
 * fitted by least squares over a time window of readings (not a number of them), and when a target
 * will be reached. One forecast for the due engine, the plan page and the meter page.
 * Pure functions, browser-safe.
 */

export interface MeterReading {
  at: Date;
  value: number;
}

const MS_PER_DAY = 86_400_000;

interface LineFit {
  /** Meter units per day. */
  slope: number;
  /** Fitted value at `originMs`. */
  intercept: number;
  /** Time origin (ms since epoch) that x = 0 refers to: the earliest reading. */
  originMs: number;
}

function assertReadings(readings: readonly MeterReading[]): void {
  if (!Array.isArray(readings)) throw new Error('readings must be an array');
  readings.forEach((r, i) => {
    if (!r || !(r.at instanceof Date) || Number.isNaN(r.at.getTime())) {
      throw new Error(`readings[${i}].at must be a valid Date`);
    }
    if (typeof r.value !== 'number' || !Number.isFinite(r.value)) {
      throw new Error(`readings[${i}].value must be a finite number, got ${String(r.value)}`);
    }
  });
}

/**
 * Ordinary least squares of value on time (days since the earliest reading, which keeps
 * the sums well conditioned): b = Σ(x−x̄)(y−ȳ) / Σ(x−x̄)², a = ȳ − b·x̄.
 * NIST e-Handbook of Statistical Methods §4.4.3.1 (least squares).
 * Returns null with fewer than 2 distinct reading times, where no line is defined.
 */
function fitLine(readings: readonly MeterReading[]): LineFit | null {
  if (readings.length < 2) return null;
  const originMs = Math.min(...readings.map((r) => r.at.getTime()));
  const xs = readings.map((r) => (r.at.getTime() - originMs) / MS_PER_DAY);
  const ys = readings.map((r) => r.value);
  const xMean = xs.reduce((s, x) => s + x, 0) / xs.length;
  const yMean = ys.reduce((s, y) => s + y, 0) / ys.length;
  let sxy = 0;
  let sxx = 0;
  xs.forEach((x, i) => {
    sxy += (x - xMean) * (ys[i] - yMean);
    sxx += (x - xMean) * (x - xMean);
  });
  if (sxx === 0) return null; // all readings at the same instant
  const slope = sxy / sxx;
  return { slope, intercept: yMean - slope * xMean, originMs };
}

/**
 * Usage rate in meter units per day: the OLS slope of value on time
 * (NIST e-Handbook §4.4.3.1) over all the readings given. Null with fewer than 2 distinct reading times.
 * Forecasts use {@link windowedUsageRate}, which first picks the readings of the time window.
 */
export function usageRatePerDay(readings: MeterReading[]): number | null {
  assertReadings(readings);
  return fitLine(readings)?.slope ?? null;
}

/** The rate is fitted on the readings of the last 28 days before the latest reading… */
export const FORECAST_WINDOW_DAYS = 28;
/** …and on at least 14 days where the history allows (two weekly cycles of a shift pattern). */
export const MIN_FORECAST_SPAN_DAYS = 14;

/**
 * The readings a rate is fitted on: every reading in the FORECAST_WINDOW_DAYS before the latest one,
 * whatever their count, plus, when those span less than MIN_FORECAST_SPAN_DAYS, the newest reading
 * at least that far back (so a meter read monthly still has two points). Whole weeks of a shift
 * pattern — nights and weekends included — weigh in, so the slope is a rate per calendar day; a
 * count of readings would cover a few hours of one shift on a counter exported every 15 minutes.
 * Returned oldest first. (House rule for the window; the fit itself is NIST §4.4.3.1.)
 */
export function forecastWindow<T extends MeterReading>(readings: readonly T[]): T[] {
  if (readings.length === 0) return [];
  const sorted = [...readings].sort((a, b) => a.at.getTime() - b.at.getTime());
  const latestMs = sorted[sorted.length - 1].at.getTime();
  const fromMs = latestMs - FORECAST_WINDOW_DAYS * MS_PER_DAY;
  const spanFloorMs = latestMs - MIN_FORECAST_SPAN_DAYS * MS_PER_DAY;
  let first = sorted.findIndex((r) => r.at.getTime() >= fromMs);
  if (sorted[first].at.getTime() > spanFloorMs) {
    // Too short a span: reach back to the newest reading at or before the 14-day mark.
    for (let i = first - 1; i >= 0; i--) {
      if (sorted[i].at.getTime() <= spanFloorMs) {
        first = i;
        break;
      }
    }
  }
  return sorted.slice(first);
}

export interface UsageRate {
  /** Meter units per calendar day. */
  ratePerDay: number;
  /** Days between the first and the last reading fitted. */
  spanDays: number;
  /** Readings fitted. */
  readings: number;
  /** Fewer than MIN_FORECAST_SPAN_DAYS of readings: a rate from part of a week can be far off. */
  provisional: boolean;
}

/** The usage rate per calendar day over the time window ({@link forecastWindow}); null without two distinct times. */
export function windowedUsageRate(readings: readonly MeterReading[]): UsageRate | null {
  assertReadings(readings);
  const win = forecastWindow(readings);
  const line = fitLine(win);
  if (!line) return null;
  const spanDays = (win[win.length - 1].at.getTime() - win[0].at.getTime()) / MS_PER_DAY;
  return { ratePerDay: line.slope, spanDays, readings: win.length, provisional: spanDays < MIN_FORECAST_SPAN_DAYS };
}

/**
 * When the readings reach `target` going from the latest reading at `ratePerDay`, or null when the
 * rate is missing, zero or runs away from the target, or the date does not fit a Date.
 *
 * Anchored at the latest reading, not at the fitted line: a counter's latest value is exact, while
 * the line's value at that moment is off by wherever the shift pattern is in its week (below the
 * reading after a busy week, above it after a weekend) — from the line, a meter still short of its
 * target could be shown as due in the past.
 */
export function projectFromLatest(latest: MeterReading, ratePerDay: number | null, target: number): Date | null {
  if (ratePerDay === null || ratePerDay === 0) return null;
  const days = (target - latest.value) / ratePerDay;
  if (days < 0) return null;
  const ms = latest.at.getTime() + days * MS_PER_DAY;
  return Number.isFinite(ms) && !Number.isNaN(new Date(ms).getTime()) ? new Date(ms) : null;
}

/**
 * Time the readings (oldest first) first reached `target` in their latest run at or above it,
 * interpolated linearly between the two readings around it; null when the latest is below.
 */
export function reachedAt(sorted: readonly MeterReading[], target: number): Date | null {
  let i = sorted.length - 1;
  if (i < 0 || sorted[i].value < target) return null;
  while (i > 0 && sorted[i - 1].value >= target) i--;
  if (i === 0) return sorted[0].at;
  const a = sorted[i - 1];
  const b = sorted[i];
  const f = (target - a.value) / (b.value - a.value);
  return new Date(a.at.getTime() + f * (b.at.getTime() - a.at.getTime()));
}

/**
 * When a rising meter reaches `target`: if the readings already did, when they did ({@link reachedAt});
 * otherwise from the latest reading along the windowed rate per calendar day ({@link windowedUsageRate},
 * {@link projectFromLatest}). Null when not reached and there is no rising rate.
 */
export function forecastReach(
  readings: readonly MeterReading[],
  target: number,
  /** For a caller that checked and sorted the readings (oldest first) and knows their windowed rate (the due engine). */
  known?: { sorted: readonly MeterReading[]; ratePerDay: number | null },
): Date | null {
  if (!known) assertReadings(readings);
  if (!Number.isFinite(target)) throw new Error(`target must be a finite number, got ${String(target)}`);
  const sorted = known?.sorted ?? [...readings].sort((a, b) => a.at.getTime() - b.at.getTime());
  if (sorted.length === 0) return null;
  const reached = reachedAt(sorted, target);
  if (reached) return reached;
  const ratePerDay = known ? known.ratePerDay : (windowedUsageRate(sorted)?.ratePerDay ?? null);
  if (ratePerDay === null || ratePerDay <= 0) return null;
  return projectFromLatest(sorted[sorted.length - 1], ratePerDay, target);
}
