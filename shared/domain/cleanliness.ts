/**
 * ISO 4406 solid-particle contamination codes for hydraulic and lubricating fluids
 * (the "18/16/13" codes on oil-analysis reports).
 *
 * The scale-number table is written out literally: the published limits are rounded
 * (e.g. 1 300, not 1 280), so a doubling formula would misplace counts near a limit.
 *
 * Pure: no I/O.
 */

/** Scale number used here for "more than 2 500 000 per mL", which ISO 4406 writes as ">28". */
export const ISO4406_OVER_RANGE = 29;

/**
 * ISO 4406:2021 / ISO 4406:1999 Table 1, "Allocation of scale numbers": particles per millilitre,
 * "more than" (exclusive) / "up to and including" (inclusive).
 */
export const ISO4406_TABLE: ReadonlyArray<{ scale: number; moreThan: number; upTo: number }> = Object.freeze([
  { scale: 0, moreThan: 0, upTo: 0.01 },
  { scale: 1, moreThan: 0.01, upTo: 0.02 },
  { scale: 2, moreThan: 0.02, upTo: 0.04 },
  { scale: 3, moreThan: 0.04, upTo: 0.08 },
  { scale: 4, moreThan: 0.08, upTo: 0.16 },
  { scale: 5, moreThan: 0.16, upTo: 0.32 },
  { scale: 6, moreThan: 0.32, upTo: 0.64 },
  { scale: 7, moreThan: 0.64, upTo: 1.3 },
  { scale: 8, moreThan: 1.3, upTo: 2.5 },
  { scale: 9, moreThan: 2.5, upTo: 5 },
  { scale: 10, moreThan: 5, upTo: 10 },
  { scale: 11, moreThan: 10, upTo: 20 },
  { scale: 12, moreThan: 20, upTo: 40 },
  { scale: 13, moreThan: 40, upTo: 80 },
  { scale: 14, moreThan: 80, upTo: 160 },
  { scale: 15, moreThan: 160, upTo: 320 },
  { scale: 16, moreThan: 320, upTo: 640 },
  { scale: 17, moreThan: 640, upTo: 1_300 },
  { scale: 18, moreThan: 1_300, upTo: 2_500 },
  { scale: 19, moreThan: 2_500, upTo: 5_000 },
  { scale: 20, moreThan: 5_000, upTo: 10_000 },
  { scale: 21, moreThan: 10_000, upTo: 20_000 },
  { scale: 22, moreThan: 20_000, upTo: 40_000 },
  { scale: 23, moreThan: 40_000, upTo: 80_000 },
  { scale: 24, moreThan: 80_000, upTo: 160_000 },
  { scale: 25, moreThan: 160_000, upTo: 320_000 },
  { scale: 26, moreThan: 320_000, upTo: 640_000 },
  { scale: 27, moreThan: 640_000, upTo: 1_300_000 },
  { scale: 28, moreThan: 1_300_000, upTo: 2_500_000 },
]);

/**
 * ISO 4406 Table 1 scale number for a concentration in particles per millilitre.
 * A concentration exactly on an upper limit takes the lower number ("up to and including").
 * Above 2 500 000 per mL returns {@link ISO4406_OVER_RANGE} (reported as ">28").
 * Zero particles is given scale 0, the lowest row (the table has nothing below it).
 */
export function iso4406ScaleNumber(particlesPerMl: number): number {
  if (typeof particlesPerMl !== 'number' || !Number.isFinite(particlesPerMl)) {
    throw new Error(`iso4406ScaleNumber: particles per mL must be a finite number, got ${String(particlesPerMl)}`);
  }
  if (particlesPerMl < 0) {
    throw new Error(`iso4406ScaleNumber: particles per mL cannot be negative, got ${particlesPerMl}`);
  }
  for (const row of ISO4406_TABLE) {
    if (particlesPerMl <= row.upTo) return row.scale;
  }
  return ISO4406_OVER_RANGE;
}

/** Particle concentrations per mL at the three ISO 4406 sizes (µm(c), ISO 11171 calibration). */
export interface ParticleCounts {
  ge4um: number;
  ge6um: number;
  ge14um: number;
}

function formatScale(scale: number | null, lowConfidence = false): string {
  if (scale === null) return '-';
  const s = scale >= ISO4406_OVER_RANGE ? '>28' : String(scale);
  return lowConfidence ? `≥${s}` : s;
}

/**
 * Three-part ISO 4406 code "R4/R6/R14" (ISO 4406:2021 §4, sizes ≥4, ≥6 and ≥14 µm(c)) from
 * concentrations per mL. A cumulative count cannot grow with size, so counts that do are rejected.
 */
export function iso4406Code(counts: ParticleCounts): string {
  if (counts === null || typeof counts !== 'object') throw new Error('iso4406Code: counts object is required');
  const names: (keyof ParticleCounts)[] = ['ge4um', 'ge6um', 'ge14um'];
  const scales = names.map((k) => {
    const v = counts[k];
    if (typeof v !== 'number' || !Number.isFinite(v) || v < 0) {
      throw new Error(`iso4406Code: ${k} must be a non-negative number of particles per mL, got ${String(v)}`);
    }
    return iso4406ScaleNumber(v);
  });
  if (counts.ge6um > counts.ge4um || counts.ge14um > counts.ge6um) {
    throw new Error(
      `iso4406Code: cumulative counts must not increase with particle size (got ≥4 µm ${counts.ge4um}, ≥6 µm ${counts.ge6um}, ≥14 µm ${counts.ge14um})`,
    );
  }
  return scales.map((s) => formatScale(s)).join('/');
}

/** One part of a parsed code: the scale number, or null for "-" (size not reported). */
export interface Iso4406Part {
  scale: number | null;
  /** Written with "≥": ISO 4406 marks a size where fewer than 20 particles were counted, so the true number may be higher. */
  lowConfidence: boolean;
}

export interface Iso4406Parsed {
  ge4um: Iso4406Part;
  ge6um: Iso4406Part;
  ge14um: Iso4406Part;
}

/**
 * Parses an ISO 4406 code such as "18/16/13", "-/16/13" (a dash for a size not reported, as with
 * microscope counts, which have no ≥4 µm part),
 * "22/20/>28" or "14/12/≥7" (">=7" is accepted too). Throws an Error naming the bad part.
 */
export function parseIso4406Code(code: string): Iso4406Parsed {
  if (typeof code !== 'string') throw new Error('parseIso4406Code: code must be a string');
  const parts = code.trim().split('/');
  if (parts.length !== 3) {
    throw new Error(`parseIso4406Code: "${code}" must have three parts separated by "/" (e.g. 18/16/13)`);
  }
  const parsed = parts.map((raw, i): Iso4406Part => {
    const p = raw.trim();
    if (p === '-') return { scale: null, lowConfidence: false };
    const m = /^(≥|>=)?\s*(>\s*28|\d{1,2})$/.exec(p);
    if (!m) throw new Error(`parseIso4406Code: part ${i + 1} "${p}" of "${code}" is not a scale number 0-28, ">28" or "-"`);
    const scale = m[2].startsWith('>') ? ISO4406_OVER_RANGE : Number(m[2]);
    if (scale > 28 && !m[2].startsWith('>')) {
      throw new Error(`parseIso4406Code: part ${i + 1} "${p}" of "${code}" is above 28; write ">28"`);
    }
    return { scale, lowConfidence: m[1] !== undefined };
  });
  const [a, b, c] = parsed;
  if (a.scale === null && b.scale === null && c.scale === null) {
    throw new Error(`parseIso4406Code: "${code}" has no scale numbers`);
  }
  const order = parsed.map((p) => p.scale).filter((s): s is number => s !== null);
  for (let i = 1; i < order.length; i++) {
    if (order[i] > order[i - 1]) {
      throw new Error(`parseIso4406Code: "${code}" has a larger number for a larger size; cumulative counts cannot grow with size`);
    }
  }
  return { ge4um: a, ge6um: b, ge14um: c };
}

/** Outcome for one particle size: null when either side does not report that size. */
export interface SizeComparison {
  actual: number | null;
  target: number | null;
  exceeds: boolean | null;
  /** actual − target in scale steps; each step is roughly a doubling of the particle count. */
  stepsOver: number | null;
}

export interface TargetComparison {
  ge4um: SizeComparison;
  ge6um: SizeComparison;
  ge14um: SizeComparison;
  /** True if any reported size is above its target. */
  exceedsAny: boolean;
}

/**
 * Compares a measured code with a target cleanliness code, size by size. A size exceeds its
 * target when its scale number is higher (ISO 4406 numbers rise with contamination; one step is
 * about a doubling, per ISO 4406:2021 §4.1).
 */
export function compareToTarget(actual: string | Iso4406Parsed, target: string | Iso4406Parsed): TargetComparison {
  const a = typeof actual === 'string' ? parseIso4406Code(actual) : actual;
  const t = typeof target === 'string' ? parseIso4406Code(target) : target;
  const one = (x: Iso4406Part, y: Iso4406Part): SizeComparison => {
    if (x.scale === null || y.scale === null) {
      return { actual: x.scale, target: y.scale, exceeds: null, stepsOver: null };
    }
    return { actual: x.scale, target: y.scale, exceeds: x.scale > y.scale, stepsOver: x.scale - y.scale };
  };
  const ge4um = one(a.ge4um, t.ge4um);
  const ge6um = one(a.ge6um, t.ge6um);
  const ge14um = one(a.ge14um, t.ge14um);
  return { ge4um, ge6um, ge14um, exceedsAny: [ge4um, ge6um, ge14um].some((s) => s.exceeds === true) };
}

export type OilVerdict = 'within' | 'caution' | 'action';

/** Steps over target at which a result is a caution and an action; a shop may set its own. */
export interface CleanlinessSteps {
  caution: number;
  action: number;
}

/**
 * One step over target is a caution, two or more call for action: common practice in oil-condition
 * monitoring, since one ISO 4406 step (about a doubling of the count, ISO 4406:2021 §4.1) is within
 * what a repeated count of the same sample can give. A shop may set its own steps.
 */
export const DEFAULT_CLEANLINESS_STEPS: CleanlinessSteps = Object.freeze({ caution: 1, action: 2 });

/**
 * Verdict of a measured ISO 4406 code against a target code, on the worst size reported on both
 * sides: 'within' when no size is over, 'caution' from `steps.caution` steps over, 'action' from
 * `steps.action` steps over. A size written "-" on either side is not judged (a target such as
 * "-/15/12" leaves the ≥4 µm count free). Throws for a code that does not parse (naming the part) or
 * for steps that are not whole numbers with 1 ≤ caution ≤ action.
 */
export function cleanlinessVerdict(
  actual: string | Iso4406Parsed,
  target: string | Iso4406Parsed,
  steps: CleanlinessSteps = DEFAULT_CLEANLINESS_STEPS,
): { verdict: OilVerdict; worstStepsOver: number; comparison: TargetComparison } {
  if (!Number.isInteger(steps.caution) || !Number.isInteger(steps.action) || steps.caution < 1 || steps.action < steps.caution) {
    throw new Error(`cleanlinessVerdict: steps must be whole numbers with 1 ≤ caution ≤ action (got ${steps.caution}, ${steps.action})`);
  }
  const comparison = compareToTarget(actual, target);
  const over = [comparison.ge4um, comparison.ge6um, comparison.ge14um].map((s) => s.stepsOver).filter((s): s is number => s !== null);
  const worstStepsOver = over.length ? Math.max(...over) : 0;
  const verdict: OilVerdict = worstStepsOver >= steps.action ? 'action' : worstStepsOver >= steps.caution ? 'caution' : 'within';
  return { verdict, worstStepsOver, comparison };
}
