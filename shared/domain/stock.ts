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
  /** Standard deviation of the lead time in days; 0 (or left out) for a fixed lead time. */
  leadTimeSdDays?: number;
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
  if (input.leadTimeSdDays !== undefined) assertNonNegative(input.leadTimeSdDays, 'leadTimeSdDays');
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
 * Reorder point ROP = d̄·L + z·√(L·σ_d² + d̄²·σ_L²): expected demand over the lead time plus
 * safety stock, for independent daily demands and a lead time that varies independently of
 * demand (variance of a random sum of L days: E[L]·Var(d) + E[d]²·Var(L); Silver, Pyke &
 * Peterson, "Inventory Management and Production Planning and Scheduling", 3rd ed., §7.11).
 * With σ_L = 0 it is the fixed-lead-time d̄·L + z·σ_d·√L. Not rounded — see reorderPointUnits.
 * A service level below 0.5 gives negative safety stock, as the formula says.
 */
export function reorderPoint(input: ReorderPointInput): number {
  assertInput(input);
  const { dailyDemandMean: d, dailyDemandSd: sd, leadTimeDays: L, serviceLevel } = input;
  const sdL = input.leadTimeSdDays ?? 0;
  const leadTimeDemandSd = Math.sqrt(L * sd * sd + d * d * sdL * sdL);
  return d * L + serviceLevelZ(serviceLevel) * leadTimeDemandSd;
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

/**
 * Order quantity that covers a shortfall in whole packs and at least the minimum order:
 * ceil(max(shortfall, MOQ) / pack)·pack. Nothing is ordered without a shortfall. Common practice.
 */
export function packedOrderQuantity(shortfall: number, packSize: number, minOrderQty = 0): number {
  if (!(Number.isFinite(packSize) && packSize > 0)) throw new Error(`packSize must be above 0, got ${String(packSize)}`);
  assertNonNegative(minOrderQty, 'minOrderQty');
  if (!(shortfall > UNIT_ROUNDING_SLACK)) return 0;
  const need = Math.max(shortfall, minOrderQty);
  return Math.ceil(need / packSize - UNIT_ROUNDING_SLACK) * packSize;
}

export interface SuggestedOrderInput {
  /** Parts expected to be used over the horizon (forecast use ÷ expected life, or daily use × days). */
  expectedUse: number;
  onHand: number;
  onOrder: number;
  /** Stock to have left at the end of the horizon (the reorder point). */
  reorderPoint: number;
  packSize: number;
  minOrderQty?: number;
}

/**
 * What to order now to last the horizon: expected use plus the reorder point, less what is on
 * hand and on order, rounded up to whole packs and at least the minimum order (common practice).
 */
export function suggestedOrder(input: SuggestedOrderInput): { shortfall: number; quantity: number } {
  assertNonNegative(input.expectedUse, 'expectedUse');
  assertNonNegative(input.onOrder, 'onOrder');
  assertNonNegative(input.reorderPoint, 'reorderPoint');
  const shortfall = Math.max(0, input.expectedUse + input.reorderPoint - Math.max(0, input.onHand) - input.onOrder);
  return { shortfall, quantity: packedOrderQuantity(shortfall, input.packSize, input.minOrderQty ?? 0) };
}
