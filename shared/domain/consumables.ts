/**
 * Torch consumable arithmetic: reference values a site may override, cut-coupon results,
 * and the split of removals into failures and suspensions for the life statistics.
 * Pure: no I/O; runs in the browser too.
 */
import { REMOVAL_REASON_KIND, type ChangeReason, type RemovalReason } from '../schemas/consumables';
import { TORCH_CATEGORIES, type TorchCategory } from '../schemas/stock';

export type ReferenceValue = { value: number; unit: string; source: string; overridden: boolean };

export type ConsumableSettings = { cutToleranceMm?: number | null; electrodePitLimitMm?: number | null; changeTargetReliability?: number | null };

/**
 * Defaults and where they come from. None is a standard; each is common practice or a shop
 * choice, and a site changes it in its settings to match its own process.
 */
export const REFERENCE_DEFAULTS = {
  /** A hafnium electrode pit of about 1 mm on air plasma is the usual change point (common practice). */
  electrodePitLimitMm: { value: 1.0, unit: 'mm', source: 'Common practice for hafnium electrodes on air plasma (about 1 mm pit depth)' },
  /** ±0.2 mm on a test coupon is a typical shop tolerance for plasma-cut parts (shop choice). */
  cutToleranceMm: { value: 0.2, unit: 'mm', source: 'Shop default ±0.2 mm on a test coupon' },
  /** Planning a change where 90 % of parts still run (B10) is common practice, not a standard. */
  changeTargetReliability: { value: 0.9, unit: '', source: 'Common practice: plan the change at B10, where 90 % of parts are still running' },
} as const;

export function referenceValues(settings: ConsumableSettings | null | undefined): Record<keyof typeof REFERENCE_DEFAULTS, ReferenceValue> {
  const pick = (key: keyof typeof REFERENCE_DEFAULTS): ReferenceValue => {
    const own = settings?.[key];
    const d = REFERENCE_DEFAULTS[key];
    return typeof own === 'number' && Number.isFinite(own)
      ? { value: own, unit: d.unit, source: `Site setting (default ${d.value}${d.unit ? ` ${d.unit}` : ''}: ${d.source})`, overridden: true }
      : { value: d.value, unit: d.unit, source: d.source, overridden: false };
  };
  return { electrodePitLimitMm: pick('electrodePitLimitMm'), cutToleranceMm: pick('cutToleranceMm'), changeTargetReliability: pick('changeTargetReliability') };
}

export type CouponDimension = { label: string; nominalMm: number; measuredMm: number };

/**
 * A coupon passes when every measured dimension lies within ±tolerance of nominal
 * (a symmetric bilateral tolerance, as ISO 286-1 / ISO 2768 write limits of size).
 * Deviations are rounded to 1 µm so 10.2 − 10 compares as 0.2, not 0.20000000000000107.
 */
export function couponResult(dimensions: CouponDimension[], toleranceMm: number) {
  if (!(toleranceMm > 0)) throw new Error(`tolerance must be above zero, got ${toleranceMm}`);
  const rows = dimensions.map((d) => {
    const deviationMm = Math.round((d.measuredMm - d.nominalMm) * 1000) / 1000;
    return { ...d, deviationMm, within: Math.abs(deviationMm) <= toleranceMm + 1e-9 };
  });
  const maxDeviationMm = rows.reduce((m, r) => Math.max(m, Math.abs(r.deviationMm)), 0);
  return { dimensions: rows, maxDeviationMm, passed: rows.every((r) => r.within) };
}

/** Share of the expected life used, or null without an expected life. */
export function lifeFraction(used: number | null, expected: number | null): number | null {
  if (used === null || expected === null || !(expected > 0)) return null;
  return Math.max(0, used / expected);
}

/** Life bar state: past the expected life is 'over', from 85 % 'near', else 'ok'. House thresholds. */
export function lifeState(fraction: number | null): 'ok' | 'near' | 'over' | 'unknown' {
  if (fraction === null) return 'unknown';
  if (fraction >= 1) return 'over';
  if (fraction >= 0.85) return 'near';
  return 'ok';
}

/**
 * The part a change was made for, when several came out together: the nozzle for a poor
 * cut, else the electrode (it wears fastest and is what operators change for), else the
 * innermost part. Shop rule of thumb (common practice).
 */
export function leadPart(categories: readonly TorchCategory[], reason?: ChangeReason | RemovalReason): TorchCategory {
  if (categories.length === 0) throw new Error('A change needs at least one part');
  if (reason === 'poor-cut' && categories.includes('nozzle')) return 'nozzle';
  if (categories.includes('electrode')) return 'electrode';
  return [...categories].sort((a, b) => TORCH_CATEGORIES.indexOf(a) - TORCH_CATEGORIES.indexOf(b))[0];
}

/**
 * One reason for a whole change, split per part: the reason applies to the lead part and the
 * others were changed with their partner; a preventive change is preventive for every part.
 * The same rule moved the older records (one reason per change) to a reason per part.
 */
export function reasonsFromSingle(categories: readonly TorchCategory[], reason: ChangeReason): Partial<Record<TorchCategory, RemovalReason>> {
  const lead = leadPart(categories, reason);
  const own: RemovalReason = reason === 'normal-wear' ? 'worn' : reason;
  return Object.fromEntries(categories.map((c) => [c, reason === 'preventive' ? 'preventive' : c === lead ? own : 'with-partner']));
}

/** The reasons the change form starts with: the lead part worn, the others changed with it. */
export function defaultReasons(categories: readonly TorchCategory[]): Partial<Record<TorchCategory, RemovalReason>> {
  return categories.length ? reasonsFromSingle(categories, 'normal-wear') : {};
}

/**
 * Splits achieved lives into failures (the part wore out) and right-censored suspensions
 * (it still had life: changed with its partner, preventive, damaged; or the process killed it;
 * or it is still installed), the inputs of a censored Weibull fit (NIST e-Handbook §8.4.1.2;
 * competing causes treated as censoring, Meeker & Escobar §15). Process faults are also counted
 * apart. Lives of zero or less carry no information and are left out.
 */
export function splitLives(removals: { life: number | null; reason: RemovalReason | null }[], stillInstalled: (number | null)[]) {
  const failures: number[] = [];
  const suspensions: number[] = [];
  let processFaults = 0;
  for (const r of removals) {
    if (r.life === null || !(r.life > 0)) continue;
    const kind = r.reason ? REMOVAL_REASON_KIND[r.reason] : 'suspension';
    if (kind === 'process') processFaults++;
    (kind === 'wear' ? failures : suspensions).push(r.life);
  }
  for (const life of stillInstalled) if (life !== null && life > 0) suspensions.push(life);
  return { failures, suspensions, processFaults };
}

/** Equal-width bins from 0 to the longest life, about √n of them (square-root choice), at most 20. */
export function lifeHistogram(failures: number[], suspensions: number[]) {
  const all = [...failures, ...suspensions];
  if (all.length === 0) return [];
  const max = Math.max(...all);
  const bins = Math.min(20, Math.max(4, Math.ceil(Math.sqrt(all.length))));
  const raw = max / bins;
  // A round bin width (1, 2, 2.5 or 5 × 10^k) so the axis reads easily.
  const mag = 10 ** Math.floor(Math.log10(raw));
  const width = [1, 2, 2.5, 5, 10].map((m) => m * mag).find((w) => w >= raw)!;
  const count = Math.ceil(max / width) || 1;
  const out = Array.from({ length: count }, (_, i) => ({ from: i * width, to: (i + 1) * width, failures: 0, suspensions: 0 }));
  const place = (v: number) => Math.min(count - 1, Math.floor(v / width));
  for (const f of failures) out[place(f)].failures++;
  for (const s of suspensions) out[place(s)].suspensions++;
  return out;
}
