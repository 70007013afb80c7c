/**
 * Consumable stock policy: reorder point for parts (electrodes, nozzles, shields, …)
 * with normally distributed daily demand and a fixed lead time. Pure, browser-safe.
 */
import jStat from 'jstat';

export interface ReorderPointInput {
  /** Mean parts used per day. */
  dailyDemandMean: number;
  /** Standard deviation of parts used per day. */
  dailyDemandSd: number;
  /** Days from placing an order to parts on the shelf. */
  leadTimeDays: number;
  /** Cycle service level: probability of no stock-out while waiting for an order, in (0, 1). */
  serviceLevel: number;
}

// An excess of 1e-9 over a whole number (e.g. 39.000000001) is float noise, not a part.
const UNIT_ROUNDING_SLACK = 1e-9;

function assertNonNegative(value: number, name: string): void {
  if (typeof value !== 'number' || !Number.isFinite(value) || value < 0) {
    throw new Error(`${name} must be a finite number ≥ 0, got ${String(value)}`);
  }
}

function assertInput(input: ReorderPointInput): void {
  if (!input || typeof input !== 'object') throw new Error('reorder point input is required');
  assertNonNegative(input.dailyDemandMean, 'dailyDemandMean');
  assertNonNegative(input.dailyDemandSd, 'dailyDemandSd');
  assertNonNegative(input.leadTimeDays, 'leadTimeDays');
  const p = input.serviceLevel;
  if (typeof p !== 'number' || !Number.isFinite(p) || p <= 0 || p >= 1) {
    throw new Error(`serviceLevel must be strictly between 0 and 1, got ${String(p)}`);
  }
}

/** Standard normal quantile z with Φ(z) = serviceLevel (jstat normal.inv). */
export function serviceLevelZ(serviceLevel: number): number {
  if (!Number.isFinite(serviceLevel) || serviceLevel <= 0 || serviceLevel >= 1) {
    throw new Error(`serviceLevel must be strictly between 0 and 1, got ${String(serviceLevel)}`);
  }
  return jStat.normal.inv(serviceLevel, 0, 1);
}

/**
 * Reorder point ROP = d̄·L + z·σ_d·√L: expected demand over the lead time plus safety
 * stock, for independent daily demands and a constant lead time (the standard
 * continuous-review model of operations-management texts; variance of a sum of L
 * independent days is L·σ_d²). Not rounded — see reorderPointUnits.
 * A service level below 0.5 gives negative safety stock, as the formula says.
 */
export function reorderPoint(input: ReorderPointInput): number {
  assertInput(input);
  const { dailyDemandMean, dailyDemandSd, leadTimeDays, serviceLevel } = input;
  const leadTimeDemand = dailyDemandMean * leadTimeDays;
  const safetyStock = serviceLevelZ(serviceLevel) * dailyDemandSd * Math.sqrt(leadTimeDays);
  return leadTimeDemand + safetyStock;
}

/**
 * Reorder point in whole parts, rounded UP so the service level is not undercut
 * (common practice), and never below 0: a shelf cannot hold negative parts.
 */
export function reorderPointUnits(input: ReorderPointInput): number {
  return Math.max(0, Math.ceil(reorderPoint(input) - UNIT_ROUNDING_SLACK));
}

/**
 * Mean and sample standard deviation (n − 1 divisor; NIST
 * e-Handbook of Statistical Methods §1.3.5.6) of daily usage, as inputs to reorderPoint.
 */
export function demandStats(dailyUsage: number[]): { mean: number; sd: number } {
  if (!Array.isArray(dailyUsage)) throw new Error('dailyUsage must be an array of numbers');
  if (dailyUsage.length < 2) {
    throw new Error(`demandStats needs at least 2 days of usage, got ${dailyUsage.length}`);
  }
  dailyUsage.forEach((v, i) => assertNonNegative(v, `dailyUsage[${i}]`));
  const mean = dailyUsage.reduce((s, v) => s + v, 0) / dailyUsage.length;
  const squares = dailyUsage.reduce((s, v) => s + (v - mean) * (v - mean), 0);
  return { mean, sd: Math.sqrt(squares / (dailyUsage.length - 1)) };
}
