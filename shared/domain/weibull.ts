/**
 * Two-parameter Weibull life model for consumable wear (electrodes, nozzles, …).
 *
 * Parameterisation: F(t) = 1 − exp(−(t/scale)^shape), as in the NIST
 * e-Handbook of Statistical Methods §8.1.6.2 (shape β, characteristic life η).
 * Pure functions: no I/O, safe in the browser.
 */
import jStat from 'jstat';

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

/** Two-sided bounds on one quantity. */
export interface Bounds {
  lower: number;
  upper: number;
}

export interface WeibullBounds {
  /** Two-sided confidence level, e.g. 0.9. */
  level: number;
  method: 'fisher-matrix';
  shape: Bounds;
  scale: Bounds;
  b10: Bounds;
  /** Covariance of (β̂, η̂) from the inverted observed information matrix. */
  covariance: [[number, number], [number, number]];
}

/**
 * Fisher-matrix (Wald) confidence bounds of a censored Weibull fit: the observed information
 * matrix of the log-likelihood at the MLE, inverted to the covariance of (β̂, η̂), with the
 * normal approximation taken on the log scale so that bounds stay positive, and B10's variance
 * by the delta method on ln t_p = ln η + ln(−ln(1−p))/β.
 * Source: Meeker & Escobar, "Statistical Methods for Reliability Data" (1998), §8.4 (normal-
 * approximation intervals for Weibull parameters and quantiles, log transformation for
 * positive quantities); information matrix of the censored likelihood as in NIST e-Handbook §8.4.1.2.
 * With few failures these bounds are too narrow (the likelihood is far from quadratic);
 * likelihood-ratio bounds are better there, which is why the pages warn below 10 failures.
 */
export function weibullConfidenceBounds(failures: number[], suspensions: number[], fit: WeibullFit, level = 0.9): WeibullBounds {
  assertPositiveLives(failures, 'failures');
  assertPositiveLives(suspensions, 'suspensions');
  assertFit(fit);
  if (!(level > 0 && level < 1)) throw new Error(`confidence level must be strictly between 0 and 1, got ${String(level)}`);
  const { shape: b, scale: e } = fit;
  const r = failures.length;
  let sw = 0;
  let swu = 0;
  let swu2 = 0;
  for (const t of [...failures, ...suspensions]) {
    const u = Math.log(t / e);
    const w = Math.exp(b * u);
    sw += w;
    swu += w * u;
    swu2 += w * u * u;
  }
  // Negative second derivatives of ln L = Σ_f [ln β − β ln η + (β−1) ln t] − Σ_all (t/η)^β.
  const iBB = r / (b * b) + swu2;
  const iEE = (b / (e * e)) * (sw - r) + ((b * b) / (e * e)) * sw;
  const iBE = (r - sw - b * swu) / e;
  const det = iBB * iEE - iBE * iBE;
  if (!(det > 0)) throw new Error('The information matrix is singular: no bounds for this fit');
  const vBB = iEE / det;
  const vEE = iBB / det;
  const vBE = -iBE / det;
  const z = jStat.normal.inv(0.5 + level / 2, 0, 1);
  const logBounds = (value: number, variance: number): Bounds => {
    const half = (z * Math.sqrt(Math.max(0, variance))) / value;
    return { lower: value * Math.exp(-half), upper: value * Math.exp(half) };
  };
  const q = Math.log(-Math.log1p(-0.1));
  const b10 = weibullBLife(fit, 0.1);
  // Gradient of ln t_p with respect to (β, η).
  const gB = -q / (b * b);
  const gE = 1 / e;
  const varLogB10 = gB * gB * vBB + 2 * gB * gE * vBE + gE * gE * vEE;
  const half = z * Math.sqrt(Math.max(0, varLogB10));
  return {
    level,
    method: 'fisher-matrix',
    shape: logBounds(b, vBB),
    scale: logBounds(e, vEE),
    b10: { lower: b10 * Math.exp(-half), upper: b10 * Math.exp(half) },
    covariance: [
      [vBB, vBE],
      [vBE, vEE],
    ],
  };
}

// Lanczos approximation (g = 7, n = 9), about 15 significant digits for x > 0.5
// (Press et al., "Numerical Recipes", §6.1); jstat's gammafn is good to only ~1e-9.
const LANCZOS = [
  0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313, -176.61502916214059, 12.507343278686905, -0.13857109526572012,
  9.9843695780195716e-6, 1.5056327351493116e-7,
];
function gamma(x: number): number {
  if (x < 0.5) return Math.PI / (Math.sin(Math.PI * x) * gamma(1 - x));
  const y = x - 1;
  let a = LANCZOS[0];
  const t = y + 7.5;
  for (let i = 1; i < 9; i++) a += LANCZOS[i] / (y + i);
  return Math.sqrt(2 * Math.PI) * Math.pow(t, y + 0.5) * Math.exp(-t) * a;
}

/** Mean life (MTTF) η·Γ(1 + 1/β) — NIST e-Handbook §8.1.6.2. */
export function weibullMeanLife(fit: WeibullFit): number {
  assertFit(fit);
  return fit.scale * gamma(1 + 1 / fit.shape);
}

/** ∫₀ᵀ R(t) dt = η·Γ(1 + 1/β)·P(1/β, (T/η)^β), P the regularised lower incomplete gamma. */
function reliabilityIntegral(fit: WeibullFit, T: number): number {
  if (T <= 0) return 0;
  return weibullMeanLife(fit) * jStat.lowRegGamma(1 / fit.shape, Math.pow(T / fit.scale, fit.shape));
}

export interface ChangeCosts {
  /** Cost of a planned change: the part and the time to fit it. */
  plannedCost: number;
  /** Cost of a failure in service: the part, scrapped sheet, damaged torch parts, downtime. */
  failureCost: number;
}

/** Long-run cost per unit of life (e.g. per arc start) of changing at age T or at failure, whichever comes first. */
export function ageReplacementCostRate(fit: WeibullFit, costs: ChangeCosts, T: number): number {
  assertFit(fit);
  const R = weibullReliability(fit, T);
  return (costs.plannedCost * R + costs.failureCost * (1 - R)) / reliabilityIntegral(fit, T);
}

/** Cost per unit of life when parts run until they fail: Cf / MTTF (renewal-reward theorem). */
export function runToFailureCostRate(fit: WeibullFit, failureCost: number): number {
  return failureCost / weibullMeanLife(fit);
}

/**
 * The cheapest planned change age of the age-replacement policy (change at age T or at failure):
 * minimises C(T) = (Cp·R(T) + Cf·F(T)) / ∫₀ᵀ R(t) dt — Barlow & Proschan, "Mathematical Theory of
 * Reliability" (1965), ch. 4. Solved from the first-order condition h(T)·∫₀ᵀR − F(T) = Cp/(Cf − Cp),
 * whose left side increases with T when the hazard h increases (β > 1); at the optimum
 * C(T*) = (Cf − Cp)·h(T*).
 * Returns null when β ≤ 1: the hazard does not rise, so a planned change never pays (run to failure).
 * Throws when the failure cost is not above the planned cost: then no change age is cheapest either.
 */
export function optimalChangeAge(fit: WeibullFit, costs: ChangeCosts): { age: number; costRate: number } | null {
  assertFit(fit);
  const { plannedCost: cp, failureCost: cf } = costs;
  if (!(Number.isFinite(cp) && cp >= 0)) throw new Error(`plannedCost must be a finite number ≥ 0, got ${String(cp)}`);
  if (!(Number.isFinite(cf) && cf >= 0)) throw new Error(`failureCost must be a finite number ≥ 0, got ${String(cf)}`);
  if (!(cf > cp)) throw new Error('failureCost must be above plannedCost: otherwise no planned change age is cheaper than running to failure');
  if (fit.shape <= 1) return null;
  const { shape: b, scale: e } = fit;
  const target = cp / (cf - cp);
  const hazard = (T: number) => (b / e) * Math.pow(T / e, b - 1);
  const condition = (T: number) => hazard(T) * reliabilityIntegral(fit, T) - (1 - weibullReliability(fit, T));
  let lo = 0;
  let hi = e;
  while (condition(hi) < target) {
    lo = hi;
    hi *= 2;
    if (hi > e * 1e6) return null; // numerically flat: no practical optimum
  }
  for (let i = 0; i < 200 && hi - lo > 1e-12 * hi; i++) {
    const mid = (lo + hi) / 2;
    if (condition(mid) < target) lo = mid;
    else hi = mid;
  }
  const age = (lo + hi) / 2;
  return { age, costRate: ageReplacementCostRate(fit, costs, age) };
}
