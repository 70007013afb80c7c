/**
 * Occupational noise dose and 8-hour TWA per OSHA 29 CFR 1910.95 and its
 * mandatory Appendix A ("Noise Exposure Computation").
 *
 * Pure module: no I/O, runs on the server and in the browser.
 */

/** Criterion level: 90 dBA for 8 h is a 100 % dose (29 CFR 1910.95 Table G-16). */
export const CRITERION_LEVEL_DBA = 90;
/** Exchange rate: each 5 dB halves the permitted time (29 CFR 1910.95 App. A, Table G-16a footnote). */
export const EXCHANGE_RATE_DB = 5;
/** Action level for the hearing conservation program (29 CFR 1910.95(c)(1)). */
export const ACTION_LEVEL_TWA_DBA = 85;
/** Permissible exposure limit as an 8-hour TWA (29 CFR 1910.95(b), Table G-16). */
export const PEL_TWA_DBA = 90;
/** Sound levels below this are left out of the dose (29 CFR 1910.95(d)(2)(i): 80 to 130 dB integrated). */
export const DOSE_THRESHOLD_DBA = 80;

/**
 * The TWA formula uses OSHA's rounded 16.61 where the exact factor is
 * 5 / log10(2) = 16.6096…, so a 50 % dose comes out at 84.9999 dBA instead of
 * 85. Comparisons allow this much slack so that 50 % and 100 % doses land on
 * 85 and 90 as 1910.95(c)(1) equates them.
 */
const TWA_TOLERANCE_DB = 0.001;

export interface NoiseExposure {
  /** A-weighted, slow-response sound level, dBA. */
  levelDbA: number;
  /** Time at that level during the work day, hours. */
  hours: number;
}

function requireFinite(value: unknown, what: string): number {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new Error(`${what} must be a finite number (got ${String(value)})`);
  }
  return value;
}

/**
 * Reference duration T, in hours, for a sound level L: T = 8 / 2^((L − 90)/5).
 *
 * Source: OSHA 29 CFR 1910.95 Appendix A, footnote formula of Table G-16a
 * (80 dBA → 32 h, 90 → 8, 95 → 4, 100 → 2, 115 → 0.25, 130 → 0.031).
 * Any finite level is accepted; Table G-16a itself lists 80–130 dBA, and
 * levels below 80 dBA do not count toward the dose (see noiseDosePercent).
 */
export function permissibleHours(levelDbA: number): number {
  requireFinite(levelDbA, 'sound level (dBA)');
  return 8 / 2 ** ((levelDbA - CRITERION_LEVEL_DBA) / EXCHANGE_RATE_DB);
}

/**
 * Which sound levels a dose integrates (OSHA 29 CFR 1910.95 App. A, I, and 1910.95(d)(2)(i)):
 * - 'hearing-conservation': 80 to 130 dBA, judged against the 85 dBA action level (1910.95(c)(1));
 * - 'pel': 90 to 140 dBA, judged against the 90 dBA permissible exposure limit (1910.95(b), Table G-16).
 * Levels under the lower bound add nothing. Levels over the upper bound are counted at their level
 * (a reading past the instrument's range must not lower a dose).
 */
export type DoseBasis = 'hearing-conservation' | 'pel';

export const DOSE_BASES: Record<DoseBasis, { fromDbA: number; toDbA: number; label: string; source: string }> = {
  'hearing-conservation': {
    fromDbA: DOSE_THRESHOLD_DBA,
    toDbA: 130,
    label: 'hearing conservation (80–130 dBA)',
    source: 'OSHA 29 CFR 1910.95(c)(1), (d)(2)(i) and App. A',
  },
  pel: { fromDbA: 90, toDbA: 140, label: 'PEL (90–140 dBA)', source: 'OSHA 29 CFR 1910.95(b)(1), Table G-16 and App. A' },
};

/**
 * Daily noise dose in percent: D = 100 · Σ Cn / Tn.
 *
 * Source: OSHA 29 CFR 1910.95 Appendix A, I(1)(ii); Tn from permissibleHours. The basis picks the
 * levels integrated (see DoseBasis): the default, 'hearing-conservation', counts from 80 dBA; 'pel'
 * counts from 90 dBA. 8 h at 90 dBA + 4 h at 85 dBA is 125 % (TWA 91.6) for the hearing
 * conservation program but 100 % (TWA 90, at the limit) for the PEL.
 *
 * Throws for a non-array, a non-finite level, negative or non-finite hours,
 * or periods totalling more than 24 hours.
 */
export function noiseDosePercent(exposures: readonly NoiseExposure[], options: { basis?: DoseBasis } = {}): number {
  if (!Array.isArray(exposures)) {
    throw new Error('exposures must be an array of { levelDbA, hours }');
  }
  const basis = options.basis ?? 'hearing-conservation';
  const range = DOSE_BASES[basis];
  if (!range) throw new Error(`basis must be 'hearing-conservation' or 'pel' (got ${String(basis)})`);
  let totalHours = 0;
  let fraction = 0;
  exposures.forEach((e: NoiseExposure, i: number) => {
    if (e === null || typeof e !== 'object') {
      throw new Error(`exposures[${i}] must be an object { levelDbA, hours }`);
    }
    const level = requireFinite(e.levelDbA, `exposures[${i}].levelDbA`);
    const hours = requireFinite(e.hours, `exposures[${i}].hours`);
    if (hours < 0) throw new Error(`exposures[${i}].hours must be >= 0 (got ${hours})`);
    totalHours += hours;
    if (level >= range.fromDbA) fraction += hours / permissibleHours(level);
  });
  // A dose is per work day; more than 24 h of periods is a data-entry error.
  if (totalHours > 24) {
    throw new Error(`exposures add up to ${totalHours} hours; a daily dose cannot cover more than 24 hours`);
  }
  return 100 * fraction;
}

/**
 * 8-hour time-weighted average sound level from a dose:
 * TWA = 16.61 · log10(D / 100) + 90.
 *
 * Source: OSHA 29 CFR 1910.95 Appendix A, I(2), and Table A-1 (dose ↔ TWA:
 * 50 % → 85, 100 % → 90, 200 % → 95). Throws for a dose that is not a
 * finite number above 0 (a 0 % dose has no finite TWA).
 */
export function twaFromDose(dosePercent: number): number {
  requireFinite(dosePercent, 'dose (%)');
  if (dosePercent <= 0) {
    throw new Error(`dose must be greater than 0 % to convert to a TWA (got ${dosePercent} %)`);
  }
  return 16.61 * Math.log10(dosePercent / 100) + CRITERION_LEVEL_DBA;
}

export type HearingExposureBand = 'below-action-level' | 'action-level' | 'over-pel';

export interface HearingProtectionStatus {
  twaDbA: number;
  band: HearingExposureBand;
  /** TWA ≥ 85 dBA: hearing conservation program applies (1910.95(c)(1)). */
  hearingConservationProgram: boolean;
  /** TWA ≥ 85 dBA: protectors must be made available at no cost (1910.95(i)(1)). */
  protectorsAvailable: boolean;
  /**
   * TWA > 90 dBA: PEL exceeded; controls required and, where they fail,
   * protectors must be worn (1910.95(b)(1), (i)(2)(i)). Between 85 and 90 dBA
   * protectors must still be worn by anyone without a baseline audiogram or
   * with a standard threshold shift (1910.95(i)(2)(ii)); that depends on the
   * person, so it is only in `description`.
   */
  protectorsRequired: boolean;
  description: string;
  sources: string[];
}

/**
 * Classifies an 8-hour TWA against the OSHA action level and PEL.
 *
 * Sources: OSHA 29 CFR 1910.95(c)(1) (program at TWA ≥ 85 dBA, i.e. dose
 * ≥ 50 %), 1910.95(i)(1)–(2) (protectors available / worn), 1910.95(b)(1)
 * with Table G-16 (PEL 90 dBA for 8 h). Bands: exactly 85.0 is at the
 * action level ("equal or exceed"); exactly 90.0 is at, not over, the PEL
 * ("exceed" is strict). A 0.001 dB tolerance absorbs the rounding in OSHA's
 * 16.61 factor so twaFromDose(50) counts as 85 and twaFromDose(100) as 90.
 */
export function hearingProtectionRequired(twaDbA: number): HearingProtectionStatus {
  requireFinite(twaDbA, 'TWA (dBA)');
  const atAction = twaDbA >= ACTION_LEVEL_TWA_DBA - TWA_TOLERANCE_DB;
  const overPel = twaDbA > PEL_TWA_DBA + TWA_TOLERANCE_DB;
  const band: HearingExposureBand = overPel ? 'over-pel' : atAction ? 'action-level' : 'below-action-level';
  const descriptions: Record<HearingExposureBand, string> = {
    'below-action-level': 'Below the 85 dBA action level: no hearing conservation program is required for this exposure.',
    'action-level':
      'At or above the 85 dBA action level: hearing conservation program (monitoring, audiometric ' +
      'testing, training) applies and hearing protectors must be made available; they must be worn ' +
      'by employees without a baseline audiogram or with a standard threshold shift.',
    'over-pel':
      'Above the 90 dBA permissible exposure limit: feasible engineering or administrative controls ' +
      'are required, and hearing protectors must be worn to bring the exposure within the limit.',
  };
  return {
    twaDbA,
    band,
    hearingConservationProgram: atAction,
    protectorsAvailable: atAction,
    protectorsRequired: overPel,
    description: descriptions[band],
    sources: ['OSHA 29 CFR 1910.95(c)(1)', 'OSHA 29 CFR 1910.95(i)(1)-(2)', 'OSHA 29 CFR 1910.95(b)(1), Table G-16'],
  };
}

/** One basis's result: the dose, its TWA (null for a 0 % dose) and whether it passes the basis's limit. */
export interface BasisVerdict {
  basis: DoseBasis;
  dosePercent: number;
  twaDbA: number | null;
  /** Hearing conservation: TWA ≥ 85 dBA (dose ≥ 50 %). PEL: TWA > 90 dBA (dose > 100 %). */
  reached: boolean;
  limitDbA: number;
  label: string;
  source: string;
}

function verdictOn(exposures: readonly NoiseExposure[], basis: DoseBasis): BasisVerdict {
  const dosePercent = noiseDosePercent(exposures, { basis });
  const twaDbA = dosePercent > 0 ? twaFromDose(dosePercent) : null;
  const limitDbA = basis === 'pel' ? PEL_TWA_DBA : ACTION_LEVEL_TWA_DBA;
  // "Equal or exceed" for the action level (1910.95(c)(1)), "exceed" for the PEL (1910.95(b)(1)).
  const reached = twaDbA !== null && (basis === 'pel' ? twaDbA > PEL_TWA_DBA + TWA_TOLERANCE_DB : twaDbA >= ACTION_LEVEL_TWA_DBA - TWA_TOLERANCE_DB);
  return { basis, dosePercent, twaDbA, reached, limitDbA, label: DOSE_BASES[basis].label, source: DOSE_BASES[basis].source };
}

/**
 * Both verdicts a day's exposure gets, each on its own basis (OSHA 29 CFR 1910.95 App. A):
 * the action level on the 80–130 dBA dose, the PEL on the 90–140 dBA dose.
 */
export function noiseVerdicts(exposures: readonly NoiseExposure[]): { actionLevel: BasisVerdict; pel: BasisVerdict } {
  return { actionLevel: verdictOn(exposures, 'hearing-conservation'), pel: verdictOn(exposures, 'pel') };
}

/** Impulse or impact noise should not exceed 140 dB peak sound pressure level (OSHA 29 CFR 1910.95(b)(2)). */
export const IMPULSE_PEAK_LIMIT_DB = 140;

/**
 * True when a peak sound pressure level (dB, C-weighted or unweighted peak, as a meter reports it)
 * is over the 140 dB ceiling for impulsive or impact noise of OSHA 29 CFR 1910.95(b)(2); exactly 140
 * is not over ("should not exceed").
 */
export function impulsePeakExceeded(peakDbC: number): boolean {
  requireFinite(peakDbC, 'peak level (dB)');
  return peakDbC > IMPULSE_PEAK_LIMIT_DB;
}

/**
 * Estimated exposure under a hearing protector from its Noise Reduction Rating.
 *
 * Source: OSHA 29 CFR 1910.95 Appendix B, the methods for A-weighted dosimeter or sound-level-meter
 * TWAs: protected TWA = TWA − (NRR − 7). For a C-weighted TWA (`weighting: 'C'`) the NRR is
 * subtracted as it is (App. B, the C-weighted methods). `derate: true` halves the attenuation term,
 * (NRR − 7) / 2: the OSHA Technical Manual (Section III, Chapter 5) applies this 50 % correction
 * when judging whether protectors are adequate in the field (from memory of the manual; the
 * Appendix itself does not derate). An NRR below 7 gives no credit with an A-weighted TWA rather
 * than a negative attenuation.
 */
export function protectedExposureDbA(twaDbA: number, nrr: number, options: { derate?: boolean; weighting?: 'A' | 'C' } = {}): number {
  requireFinite(twaDbA, 'TWA (dBA)');
  requireFinite(nrr, 'NRR (dB)');
  if (nrr < 0) throw new Error(`NRR must be >= 0 (got ${nrr})`);
  const attenuation = Math.max(0, options.weighting === 'C' ? nrr : nrr - 7);
  return twaDbA - (options.derate ? attenuation / 2 : attenuation);
}

/** One task's share of a person's day: the task's noise periods as that person spends them. */
export interface TaskExposure {
  label: string;
  exposures: readonly NoiseExposure[];
}

/**
 * A person's daily dose from several tasks (at several machines): each task's partial dose, and
 * their sum, which is the App. A formula D = 100 · Σ Cn / Tn over all the day's periods (OSHA 29
 * CFR 1910.95 App. A, I(1)(ii)); both bases. The periods of all tasks may not add up to more than
 * 24 hours.
 */
export function dailyDoseAcrossTasks(tasks: readonly TaskExposure[]): {
  tasks: { label: string; actionLevelDosePercent: number; pelDosePercent: number }[];
  actionLevel: BasisVerdict;
  pel: BasisVerdict;
} {
  if (!Array.isArray(tasks)) throw new Error('tasks must be an array of { label, exposures }');
  const all = tasks.flatMap((t) => t.exposures);
  const { actionLevel, pel } = noiseVerdicts(all);
  return {
    tasks: tasks.map((t) => ({
      label: t.label,
      actionLevelDosePercent: noiseDosePercent(t.exposures),
      pelDosePercent: noiseDosePercent(t.exposures, { basis: 'pel' }),
    })),
    actionLevel,
    pel,
  };
}
