/**
 * ISO viscosity grades (ISO VG) of industrial liquid lubricants and a simple in-band check for
 * used-oil analysis results.
 *
 * The limits are written out as the published table, not computed, so the values shown to a
 * user are exactly the ones printed in the standard.
 *
 * Pure: no I/O.
 */

export interface ViscosityGradeLimits {
  /** Mid-point kinematic viscosity at 40 °C, mm²/s (cSt). */
  midpoint: number;
  /** Minimum kinematic viscosity at 40 °C, mm²/s. */
  min: number;
  /** Maximum kinematic viscosity at 40 °C, mm²/s. */
  max: number;
  /** Which table the row comes from. */
  standard: 'ISO 3448' | 'ASTM D2422';
}

/**
 * ISO 3448:1992 Table 1 (18 grades, VG 2 … VG 1500), kinematic viscosity limits at 40 °C in
 * mm²/s. VG 2200 and VG 3200 are not in ISO 3448:1992; they are the two extra grades of
 * ASTM D2422-97 Table 1, built the same way (±10 % of the mid-point).
 */
const GRADE_TABLE: ReadonlyArray<readonly [grade: number, midpoint: number, min: number, max: number, standard: ViscosityGradeLimits['standard']]> = [
  [2, 2.2, 1.98, 2.42, 'ISO 3448'],
  [3, 3.2, 2.88, 3.52, 'ISO 3448'],
  [5, 4.6, 4.14, 5.06, 'ISO 3448'],
  [7, 6.8, 6.12, 7.48, 'ISO 3448'],
  [10, 10, 9.0, 11.0, 'ISO 3448'],
  [15, 15, 13.5, 16.5, 'ISO 3448'],
  [22, 22, 19.8, 24.2, 'ISO 3448'],
  [32, 32, 28.8, 35.2, 'ISO 3448'],
  [46, 46, 41.4, 50.6, 'ISO 3448'],
  [68, 68, 61.2, 74.8, 'ISO 3448'],
  [100, 100, 90.0, 110, 'ISO 3448'],
  [150, 150, 135, 165, 'ISO 3448'],
  [220, 220, 198, 242, 'ISO 3448'],
  [320, 320, 288, 352, 'ISO 3448'],
  [460, 460, 414, 506, 'ISO 3448'],
  [680, 680, 612, 748, 'ISO 3448'],
  [1000, 1000, 900, 1100, 'ISO 3448'],
  [1500, 1500, 1350, 1650, 'ISO 3448'],
  [2200, 2200, 1980, 2420, 'ASTM D2422'],
  [3200, 3200, 2880, 3520, 'ASTM D2422'],
];

const BY_GRADE = new Map(GRADE_TABLE.map(([g, midpoint, min, max, standard]) => [g, { midpoint, min, max, standard }]));

/** The grade numbers known here, ascending (ISO 3448 Table 1 plus ASTM D2422's VG 2200/3200). */
export const ISO_VG_GRADES: readonly number[] = Object.freeze(GRADE_TABLE.map(([g]) => g));

/**
 * Kinematic viscosity limits at 40 °C for an ISO viscosity grade, from ISO 3448 Table 1
 * (VG 2200/3200 from ASTM D2422 Table 1). Unknown grades are rejected.
 */
export function isoViscosityGradeLimits(grade: number): ViscosityGradeLimits {
  const row = typeof grade === 'number' ? BY_GRADE.get(grade) : undefined;
  if (!row) {
    throw new Error(`isoViscosityGradeLimits: ISO VG ${String(grade)} is not a standard grade (known: ${ISO_VG_GRADES.join(', ')})`);
  }
  return { ...row };
}

export type ViscosityBand = 'within' | 'near-limit' | 'below' | 'above';

export interface ViscosityStatus {
  band: ViscosityBand;
  /** True when the result is inside the grade's min–max range. */
  withinGrade: boolean;
  /** (measured − midpoint) / midpoint, e.g. −0.12 for 12 % thin. */
  deviation: number;
  limits: ViscosityGradeLimits;
}

/**
 * Where a measured kinematic viscosity at 40 °C (mm²/s, e.g. by ISO 3104) sits against its grade's
 * ISO 3448 band. 'below'/'above' = outside min–max. With `warnFraction` (0 < f < 0.10), a result
 * still inside the band but more than f from the mid-point is 'near-limit', so the oil-analysis
 * screen can flag drift before the grade is left. Exactly on min or max counts as within (the
 * table's limits are inclusive).
 */
export function viscosityStatus(measured: number, grade: number, options: { warnFraction?: number } = {}): ViscosityStatus {
  if (typeof measured !== 'number' || !Number.isFinite(measured) || measured <= 0) {
    throw new Error(`viscosityStatus: measured viscosity must be a positive number of mm²/s, got ${String(measured)}`);
  }
  const limits = isoViscosityGradeLimits(grade);
  const { warnFraction } = options;
  if (warnFraction !== undefined && (!Number.isFinite(warnFraction) || warnFraction <= 0 || warnFraction >= 0.1)) {
    throw new Error(`viscosityStatus: warnFraction must be greater than 0 and less than 0.10 (the ISO 3448 band is ±10 %), got ${String(warnFraction)}`);
  }
  const deviation = (measured - limits.midpoint) / limits.midpoint;
  let band: ViscosityBand;
  if (measured < limits.min) band = 'below';
  else if (measured > limits.max) band = 'above';
  else if (warnFraction !== undefined && Math.abs(deviation) > warnFraction) band = 'near-limit';
  else band = 'within';
  return { band, withinGrade: band === 'within' || band === 'near-limit', deviation, limits };
}

/** Change from the new-oil value, in percent, at which a result is a caution and an action. */
export interface ViscosityLimits {
  cautionPercent: number;
  actionPercent: number;
}

/**
 * ±10 % caution, ±20 % action: common practice in used-oil analysis for industrial and hydraulic
 * oils (not from a standard); a shop may set its own.
 */
export const DEFAULT_VISCOSITY_LIMITS: ViscosityLimits = Object.freeze({ cautionPercent: 10, actionPercent: 20 });

/**
 * Change of a used oil's kinematic viscosity at 40 °C from its new-oil baseline (the value measured
 * on, or printed for, the oil as delivered), and its verdict: at or beyond ±cautionPercent a caution,
 * at or beyond ±actionPercent action. The ISO VG band (ISO 3448) classifies new oil and is not used
 * to condemn used oil. Throws for non-positive viscosities or limits with 0 < caution ≤ action not met.
 */
export function viscosityChange(
  measuredCst: number,
  baselineCst: number,
  limits: ViscosityLimits = DEFAULT_VISCOSITY_LIMITS,
): { changePercent: number; verdict: 'within' | 'caution' | 'action' } {
  for (const [name, v] of [
    ['measuredCst', measuredCst],
    ['baselineCst', baselineCst],
  ] as const) {
    if (typeof v !== 'number' || !Number.isFinite(v) || v <= 0)
      throw new Error(`viscosityChange: ${name} must be a positive number of mm²/s, got ${String(v)}`);
  }
  const { cautionPercent, actionPercent } = limits;
  if (!(Number.isFinite(cautionPercent) && Number.isFinite(actionPercent) && cautionPercent > 0 && actionPercent >= cautionPercent)) {
    throw new Error(`viscosityChange: limits need 0 < cautionPercent ≤ actionPercent (got ${cautionPercent}, ${actionPercent})`);
  }
  const changePercent = ((measuredCst - baselineCst) / baselineCst) * 100;
  // Compared after rounding to 1e-9 %, so 55.2 against 46 is +20 % exactly, not 19.999…
  const size = Math.round(Math.abs(changePercent) * 1e9) / 1e9;
  const verdict = size >= actionPercent ? 'action' : size >= cautionPercent ? 'caution' : 'within';
  return { changePercent, verdict };
}
