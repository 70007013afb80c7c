/**
 * Two-parameter Weibull life model for consumable wear (electrodes, nozzles, …).
 *
 * Parameterisation: F(t) = 1 − exp(−(t/scale)^shape), as in the NIST
 * e-Handbook of Statistical Methods §8.1.6.2 (shape β, characteristic life η).
 * Pure functions: no I/O, safe in the browser.
 */

export interface WeibullFit {
  /** β: < 1 early failures, ≈ 1 random, > 1 wear-out. */
  shape: number;
  /** η: characteristic life, the life by which 63.2 % have failed. */
  scale: number;
}

const MIN_SHAPE = 1e-3;
const MAX_SHAPE = 1e5;
const SHAPE_TOLERANCE = 1e-12;
const MAX_ITERATIONS = 200;

function assertPositiveLives(values: readonly number[], label: string): void {
  if (!Array.isArray(values)) throw new Error(`${label} must be an array of numbers`);
  values.forEach((v, i) => {
    if (typeof v !== 'number' || !Number.isFinite(v)) {
      throw new Error(`${label}[${i}] must be a finite number, got ${String(v)}`);
    }
    if (v <= 0) throw new Error(`${label}[${i}] must be positive, got ${v}`);
  });
}

function assertFit(fit: WeibullFit): void {
  if (!fit || !Number.isFinite(fit.shape) || fit.shape <= 0) {
    throw new Error(`Weibull shape must be a positive finite number, got ${String(fit?.shape)}`);
  }
  if (!Number.isFinite(fit.scale) || fit.scale <= 0) {
    throw new Error(`Weibull scale must be a positive finite number, got ${String(fit.scale)}`);
  }
}

/**
 * Log-lives divided by the longest life, so that (t/tmax)^β never overflows
 * however large β gets; the profile equation is unchanged by this rescaling.
 */
interface ScaledSample {
  logAll: number[]; // ln(t/tmax) for failures and suspensions
  meanLogFailure: number; // mean of ln(t/tmax) over failures only
  failureCount: number;
  logMax: number; // ln(tmax)
}

function scaleSample(failures: readonly number[], suspensions: readonly number[]): ScaledSample {
  const all = [...failures, ...suspensions];
  const logMax = Math.log(Math.max(...all));
  const logAll = all.map((t) => Math.log(t) - logMax);
  const meanLogFailure = failures.reduce((sum, t) => sum + (Math.log(t) - logMax), 0) / failures.length;
  return { logAll, meanLogFailure, failureCount: failures.length, logMax };
}

/**
 * Profile (shape-only) MLE equation and its derivative for right-censored data:
 * the censored likelihood of NIST e-Handbook §8.4.1.2 with η eliminated,
 *   g(β) = Σ t^β ln t / Σ t^β − 1/β − (1/r) Σ_failures ln t = 0,
 * sums over failures and suspensions, r = number of failures. g is increasing in β,
 * so the root is unique when it exists.
 */
function profileEquation(sample: ScaledSample, beta: number): { g: number; dg: number } {
  let s0 = 0;
  let s1 = 0;
  let s2 = 0;
  for (const y of sample.logAll) {
    const w = Math.exp(beta * y);
    s0 += w;
    s1 += w * y;
    s2 += w * y * y;
  }
  const m1 = s1 / s0;
  const variance = Math.max(0, s2 / s0 - m1 * m1);
  return {
    g: m1 - 1 / beta - sample.meanLogFailure,
    dg: variance + 1 / (beta * beta),
  };
}

/** Finds [lo, hi] with g(lo) < 0 < g(hi) by doubling from β = 1. */
function bracketShape(sample: ScaledSample): [number, number] {
  let lo = 1;
  let hi = 1;
  while (profileEquation(sample, lo).g > 0) {
    lo /= 2;
    if (lo < MIN_SHAPE) throw new Error('Weibull fit did not converge: shape below 0.001');
  }
  while (profileEquation(sample, hi).g < 0) {
    hi *= 2;
    if (hi > MAX_SHAPE) {
      throw new Error('Weibull fit has no finite shape: failure lives are (nearly) identical and no suspension outlasts them');
    }
  }
  return [lo, hi];
}

/** Newton steps on g, falling back to bisection whenever a step leaves the bracket. */
function solveShape(sample: ScaledSample): number {
  let [lo, hi] = bracketShape(sample);
  let beta = (lo + hi) / 2;
  for (let i = 0; i < MAX_ITERATIONS; i++) {
    const { g, dg } = profileEquation(sample, beta);
    if (g === 0) return beta;
    if (g < 0) lo = beta;
    else hi = beta;
    const newton = beta - g / dg;
    const next = newton > lo && newton < hi ? newton : (lo + hi) / 2;
    if (Math.abs(next - beta) <= SHAPE_TOLERANCE * next) return next;
    beta = next;
  }
  return beta;
}

/** Closed-form scale for a given shape: η = (Σ t^β / r)^(1/β), over failures and suspensions. */
function scaleForShape(sample: ScaledSample, beta: number): number {
  const sum = sample.logAll.reduce((acc, y) => acc + Math.exp(beta * y), 0);
  return Math.exp(sample.logMax + Math.log(sum / sample.failureCount) / beta);
}

/**
 * Maximum-likelihood 2-parameter Weibull fit with right-censored suspensions
 * (parts removed for reasons other than wear, or still installed).
 * Method: profile likelihood equation for β solved by safeguarded Newton, then η in
 * closed form — NIST e-Handbook of Statistical Methods §8.4.1.2 (MLE) and
 * §8.4.1.3 (worked censored example).
 */
export function fitWeibull(failures: number[], suspensions: number[] = []): WeibullFit {
  assertPositiveLives(failures, 'failures');
  assertPositiveLives(suspensions, 'suspensions');
  if (failures.length < 2) {
    throw new Error(`Weibull fit needs at least 2 failures, got ${failures.length}`);
  }
  const sample = scaleSample(failures, suspensions);
  const shape = solveShape(sample);
  return { shape, scale: scaleForShape(sample, shape) };
}

/**
 * Reliability (survival) R(t) = exp(−(t/η)^β): the share of parts still running at life t.
 * NIST e-Handbook §8.1.6.2.
 */
export function weibullReliability(fit: WeibullFit, t: number): number {
  assertFit(fit);
  if (!Number.isFinite(t) || t < 0) {
    throw new Error(`life t must be a finite number ≥ 0, got ${String(t)}`);
  }
  return Math.exp(-Math.pow(t / fit.scale, fit.shape));
}

/**
 * B-life: the life by which `fraction` of the population has failed (0.1 → B10),
 * the inverse CDF t = η·(−ln(1−p))^(1/β) — NIST e-Handbook §8.1.6.2.
 */
export function weibullBLife(fit: WeibullFit, fraction: number): number {
  assertFit(fit);
  if (!Number.isFinite(fraction) || fraction <= 0 || fraction >= 1) {
    throw new Error(`failed fraction must be strictly between 0 and 1, got ${String(fraction)}`);
  }
  // -log1p(-p) keeps precision for small fractions such as B1.
  return fit.scale * Math.pow(-Math.log1p(-fraction), 1 / fit.shape);
}

/**
 * Life at which reliability falls to `targetReliability` — a planned change point.
 * The target is a shop choice; 0.9 (change at B10) is common practice, not a standard.
 * Same inverse CDF as weibullBLife (NIST e-Handbook §8.1.6.2).
 */
export function recommendedChangePoint(fit: WeibullFit, targetReliability = 0.9): number {
  if (!Number.isFinite(targetReliability) || targetReliability <= 0 || targetReliability >= 1) {
    throw new Error(`target reliability must be strictly between 0 and 1, got ${String(targetReliability)}`);
  }
  return weibullBLife(fit, 1 - targetReliability);
}
