import { describe, it, expect } from 'vitest';
import jStat from 'jstat';
import { fitWeibull, recommendedChangePoint, weibullBLife, weibullReliability, type WeibullFit } from '../../shared/domain/weibull';

/** Seeded 32-bit PRNG (mulberry32) so the property tests are deterministic. */
function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Weibull draws by inverse transform, using jstat's inverse CDF (not the module under test). */
function weibullSample(n: number, shape: number, scale: number, seed: number): number[] {
  const rand = mulberry32(seed);
  return Array.from({ length: n }, () => jStat.weibull.inv(rand(), scale, shape));
}

/**
 * Censored log-likelihood written independently of the module (NIST e-Handbook §8.4.1.2):
 * Σ ln f(failure) from the Weibull density, plus Σ ln R(suspension) with R = 1 − jstat CDF.
 */
function logLikelihood(fit: WeibullFit, failures: number[], suspensions: number[]): number {
  const { shape, scale } = fit;
  const pdfTerms = failures.reduce((s, t) => {
    const ln = Math.log(shape / scale) + (shape - 1) * Math.log(t / scale) - (t / scale) ** shape;
    return s + ln;
  }, 0);
  const survivalTerms = suspensions.reduce((s, t) => s + Math.log(1 - jStat.weibull.cdf(t, scale, shape)), 0);
  return pdfTerms + survivalTerms;
}

// NIST e-Handbook of Statistical Methods §8.4.1.3 ("A Weibull maximum likelihood
// estimation example"), data from §8.2.2.1: 20 units, 10 failures, 10 removed
// unfailed at 500 h.
const NIST_FAILURES = [54, 187, 216, 240, 244, 335, 361, 373, 375, 386];
const NIST_SUSPENSIONS = Array<number>(10).fill(500);

describe('fitWeibull against published worked examples', () => {
  it('complete data: six units failing at 16, 34, 53, 75, 93, 120 h', () => {
    // Published MLE worked example for complete data (no suspensions) in a reliability
    // life-data-analysis reference, chapter "Weibull Parameter Estimation":
    // β̂ = 1.933, η̂ = 73.526, printed to 3 decimals → tolerance ±0.0005.
    // (Independently reproduced with scipy.stats.weibull_min.fit: 1.93268, 73.5260.)
    const fit = fitWeibull([93, 34, 16, 120, 53, 75]);
    expect(Math.abs(fit.shape - 1.933)).toBeLessThan(0.0005);
    expect(Math.abs(fit.scale - 73.526)).toBeLessThan(0.0005);
  });

  it('right-censored data: NIST §8.4.1.3 example', () => {
    // NIST e-Handbook §8.4.1.3: β̂ = 1.7208, η̂ = 606.5280.
    // Shape printed to 4 decimals → ±0.00005. The printed scale is 0.0004 above the
    // converged MLE (scipy's censored fit also gives 606.5276), so ±0.001 (1.6e-6 relative).
    const fit = fitWeibull(NIST_FAILURES, NIST_SUSPENSIONS);
    expect(Math.abs(fit.shape - 1.7208)).toBeLessThan(0.00005);
    expect(Math.abs(fit.scale - 606.528)).toBeLessThan(0.001);
  });

  it('right-censored data: log-likelihood at the fit matches NIST §8.4.1.3 (−75.135)', () => {
    // NIST e-Handbook §8.4.1.3 prints log-likelihood −75.135 and AIC 154.27.
    const fit = fitWeibull(NIST_FAILURES, NIST_SUSPENSIONS);
    const ll = logLikelihood(fit, NIST_FAILURES, NIST_SUSPENSIONS);
    expect(Math.abs(ll - -75.135)).toBeLessThan(0.0005);
    expect(Math.abs(2 * 2 - 2 * ll - 154.27)).toBeLessThan(0.005);
  });

  it('the fit is a maximum of the independently written censored likelihood', () => {
    const fit = fitWeibull(NIST_FAILURES, NIST_SUSPENSIONS);
    const best = logLikelihood(fit, NIST_FAILURES, NIST_SUSPENSIONS);
    for (const [ds, de] of [
      [1.01, 1],
      [0.99, 1],
      [1, 1.01],
      [1, 0.99],
      [1.005, 1.005],
      [0.995, 0.995],
    ]) {
      const nudged = { shape: fit.shape * ds, scale: fit.scale * de };
      expect(logLikelihood(nudged, NIST_FAILURES, NIST_SUSPENSIONS)).toBeLessThan(best);
    }
  });
});

describe('fitWeibull properties', () => {
  it('recovers shape and scale from a large seeded complete sample (within 3 %)', () => {
    // MLE is consistent; with n = 5000 the standard error of β̂ is ≈ 0.78·β/√n ≈ 1.1 %.
    const lives = weibullSample(5000, 2.5, 1200, 20240611);
    const fit = fitWeibull(lives);
    expect(Math.abs(fit.shape / 2.5 - 1)).toBeLessThan(0.03);
    expect(Math.abs(fit.scale / 1200 - 1)).toBeLessThan(0.03);
  });

  it('recovers shape and scale when about a third of the sample is suspended (within 5 %)', () => {
    // Random right-censoring: each part is removed at a uniform time in (0, 2.5·η) unless it
    // wore out first. Ignoring suspensions would bias the fit; the MLE must not be biased.
    const shape = 3;
    const scale = 800;
    const lives = weibullSample(6000, shape, scale, 7);
    const removal = mulberry32(99);
    const failures: number[] = [];
    const suspensions: number[] = [];
    for (const life of lives) {
      const removedAt = removal() * 2.5 * scale;
      if (life <= removedAt) failures.push(life);
      else suspensions.push(removedAt);
    }
    expect(suspensions.length / lives.length).toBeGreaterThan(0.25);
    const fit = fitWeibull(failures, suspensions);
    expect(Math.abs(fit.shape / shape - 1)).toBeLessThan(0.05);
    expect(Math.abs(fit.scale / scale - 1)).toBeLessThan(0.05);
    // Dropping the suspensions under-estimates life, as expected for censored data.
    expect(fitWeibull(failures).scale).toBeLessThan(fit.scale * 0.95);
  });

  it('is scale-equivariant: lives ×1e6 give the same shape and scale ×1e6', () => {
    // MLE invariance: rescaling the time unit must only rescale η. Large values (arc
    // starts, hits) must not overflow t^β.
    const base = fitWeibull(NIST_FAILURES, NIST_SUSPENSIONS);
    const big = fitWeibull(
      NIST_FAILURES.map((t) => t * 1e6),
      NIST_SUSPENSIONS.map((t) => t * 1e6),
    );
    expect(big.shape).toBeCloseTo(base.shape, 9);
    expect(big.scale / 1e6).toBeCloseTo(base.scale, 6);
  });

  it('handles a very steep wear-out (nearly identical lives) without overflow', () => {
    const fit = fitWeibull([1000, 1010, 1020, 1030]);
    expect(fit.shape).toBeGreaterThan(100);
    expect(Number.isFinite(fit.scale)).toBe(true);
    // A steep Weibull puts η just above the failures.
    expect(fit.scale).toBeGreaterThan(1010);
    expect(fit.scale).toBeLessThan(1040);
  });
});

describe('weibullBLife, weibullReliability, recommendedChangePoint', () => {
  const fit = { shape: 2.2, scale: 450 };

  it('B10 is where reliability is 0.90 (checked with jstat CDF and the module)', () => {
    const b10 = weibullBLife(fit, 0.1);
    // Independent evaluation: jstat Weibull CDF at B10 is 0.10.
    expect(jStat.weibull.cdf(b10, fit.scale, fit.shape)).toBeCloseTo(0.1, 12);
    expect(weibullReliability(fit, b10)).toBeCloseTo(0.9, 12);
    expect(b10).toBeCloseTo(jStat.weibull.inv(0.1, fit.scale, fit.shape), 9);
  });

  it('B-life of an exponential (β = 1) at 50 % is η·ln 2, the exponential median', () => {
    // NIST e-Handbook §8.1.6.1: exponential median = ln 2 / λ = η·ln 2.
    expect(weibullBLife({ shape: 1, scale: 1000 }, 0.5)).toBeCloseTo(1000 * Math.LN2, 9);
  });

  it('reliability at the characteristic life is e^−1 (63.2 % failed)', () => {
    // NIST e-Handbook §8.1.6.2: η is the life by which 63.2 % of units have failed.
    expect(weibullReliability(fit, fit.scale)).toBeCloseTo(Math.exp(-1), 12);
    expect(weibullReliability(fit, 0)).toBe(1);
  });

  it('reliability matches 1 − jstat Weibull CDF over a range of lives', () => {
    for (const t of [1, 50, 200, 450, 900, 2000]) {
      expect(weibullReliability(fit, t)).toBeCloseTo(1 - jStat.weibull.cdf(t, fit.scale, fit.shape), 12);
    }
  });

  it('recommended change point defaults to B10 and follows the target', () => {
    // 0.9 default is common practice; the target is a shop choice.
    expect(recommendedChangePoint(fit)).toBeCloseTo(weibullBLife(fit, 0.1), 9);
    const at95 = recommendedChangePoint(fit, 0.95);
    expect(weibullReliability(fit, at95)).toBeCloseTo(0.95, 12);
    expect(at95).toBeLessThan(recommendedChangePoint(fit));
  });
});

describe('bad input', () => {
  it('fitWeibull rejects fewer than 2 failures', () => {
    expect(() => fitWeibull([])).toThrow(/at least 2 failures/);
    expect(() => fitWeibull([100], [200, 300])).toThrow(/at least 2 failures/);
  });

  it('fitWeibull rejects NaN, infinite, zero and negative lives', () => {
    expect(() => fitWeibull([100, Number.NaN])).toThrow(/failures\[1\].*finite/);
    expect(() => fitWeibull([100, Number.POSITIVE_INFINITY])).toThrow(/finite/);
    expect(() => fitWeibull([100, 0])).toThrow(/failures\[1\].*positive/);
    expect(() => fitWeibull([-5, 100])).toThrow(/failures\[0\].*positive/);
    expect(() => fitWeibull([100, 200], [Number.NaN])).toThrow(/suspensions\[0\].*finite/);
    expect(() => fitWeibull([100, 200], [-1])).toThrow(/suspensions\[0\].*positive/);
  });

  it('fitWeibull rejects identical failure lives with no longer suspension (no finite MLE)', () => {
    expect(() => fitWeibull([500, 500, 500])).toThrow(/no finite shape/);
    // A suspension beyond them makes the likelihood bounded again.
    expect(Number.isFinite(fitWeibull([500, 500, 500], [800]).shape)).toBe(true);
  });

  it('weibullBLife rejects fractions outside (0, 1) and bad fits', () => {
    const fit = { shape: 2, scale: 100 };
    for (const p of [0, 1, -0.1, 1.5, Number.NaN]) {
      expect(() => weibullBLife(fit, p)).toThrow(/fraction/);
    }
    expect(() => weibullBLife({ shape: 0, scale: 100 }, 0.1)).toThrow(/shape/);
    expect(() => weibullBLife({ shape: 2, scale: Number.NaN }, 0.1)).toThrow(/scale/);
  });

  it('weibullReliability rejects negative or non-finite life', () => {
    const fit = { shape: 2, scale: 100 };
    expect(() => weibullReliability(fit, -1)).toThrow(/life t/);
    expect(() => weibullReliability(fit, Number.NaN)).toThrow(/life t/);
  });

  it('recommendedChangePoint rejects targets outside (0, 1)', () => {
    const fit = { shape: 2, scale: 100 };
    for (const r of [0, 1, 1.2, Number.NaN]) {
      expect(() => recommendedChangePoint(fit, r)).toThrow(/target reliability/);
    }
  });
});
