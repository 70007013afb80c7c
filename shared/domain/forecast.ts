/**
 * Meter forecasting (arc starts, hits, hours): fit a straight line to recent readings
 * and project when a target will be reached. Pure functions, browser-safe.
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

/** Latest reading time and its value (largest value if several share that time). */
function latestReading(readings: readonly MeterReading[]): { ms: number; value: number } {
  let ms = -Infinity;
  let value = -Infinity;
  for (const r of readings) {
    const t = r.at.getTime();
    if (t > ms || (t === ms && r.value > value)) {
      ms = t;
      value = r.value;
    }
  }
  return { ms, value };
}

/** Time (ms) at which the fitted line reaches `target`, or null if not a valid Date. */
function crossingMs(line: LineFit, target: number): number | null {
  const ms = line.originMs + ((target - line.intercept) / line.slope) * MS_PER_DAY;
  return Number.isFinite(ms) && !Number.isNaN(new Date(ms).getTime()) ? ms : null;
}

/**
 * Usage rate in meter units per day: the OLS slope of value on time
 * (NIST e-Handbook §4.4.3.1). Null with fewer than 2 distinct reading times.
 */
export function usageRatePerDay(readings: MeterReading[]): number | null {
  assertReadings(readings);
  return fitLine(readings)?.slope ?? null;
}

/**
 * When a meter growing at its fitted OLS rate (NIST e-Handbook §4.4.3.1) reaches `target`.
 *
 * - Null when fewer than 2 distinct reading times exist, the fitted slope is ≤ 0
 *   (the meter is not advancing, so it never gets there), or the date falls outside
 *   the range a Date can hold.
 * - Already reached (latest reading ≥ target): a due date in the future would be
 *   wrong, so the answer is the fitted crossing time capped at the latest reading
 *   time — how long ago it was likely reached. Without a rising fit the latest
 *   reading time is returned: the data show it reached by then, whatever the trend.
 */
export function forecastReach(readings: MeterReading[], target: number): Date | null {
  assertReadings(readings);
  if (!Number.isFinite(target)) throw new Error(`target must be a finite number, got ${String(target)}`);
  if (readings.length === 0) return null;
  const line = fitLine(readings);
  const rising = line !== null && line.slope > 0;
  const latest = latestReading(readings);
  if (latest.value >= target) {
    const fitted = rising ? crossingMs(line, target) : null;
    return new Date(fitted === null ? latest.ms : Math.min(fitted, latest.ms));
  }
  if (!rising) return null;
  const ms = crossingMs(line, target);
  return ms === null ? null : new Date(ms);
}
