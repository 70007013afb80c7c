import { describe, it, expect } from 'vitest';
import {
  couponResult,
  defaultReasons,
  leadPart,
  lifeFraction,
  lifeHistogram,
  lifeState,
  reasonsFromSingle,
  referenceValues,
  splitLives,
} from '../../shared/domain/consumables';

describe('couponResult', () => {
  // Symmetric bilateral tolerance ±t: a size passes when |measured − nominal| ≤ t (ISO 286-1 limits of size).
  it('passes on the limit and fails just past it', () => {
    const r = couponResult(
      [
        { label: 'L', nominalMm: 10, measuredMm: 10.2 },
        { label: 'W', nominalMm: 50, measuredMm: 49.8 },
      ],
      0.2,
    );
    expect(r.passed).toBe(true);
    expect(r.dimensions.map((d) => d.deviationMm)).toEqual([0.2, -0.2]);
    expect(couponResult([{ label: 'L', nominalMm: 10, measuredMm: 10.201 }], 0.2)).toMatchObject({ passed: false, maxDeviationMm: 0.201 });
  });
  it('refuses a tolerance of zero or less', () => {
    expect(() => couponResult([], 0)).toThrow('tolerance must be above zero, got 0');
  });
});

describe('referenceValues', () => {
  it('gives the defaults with their source, and a site value marked as such', () => {
    const d = referenceValues({});
    expect(d.cutToleranceMm).toMatchObject({ value: 0.2, unit: 'mm', overridden: false });
    expect(d.electrodePitLimitMm.source).toMatch(/Common practice/);
    expect(d.changeTargetReliability.value).toBe(0.9);
    const s = referenceValues({ cutToleranceMm: 0.15 });
    expect(s.cutToleranceMm).toMatchObject({ value: 0.15, overridden: true });
    expect(s.cutToleranceMm.source).toMatch(/^Site setting \(default 0.2 mm/);
  });
});

describe('life helpers', () => {
  it('splits removals into failures and suspensions; parts still in are suspensions; empty lives are dropped', () => {
    // Right-censoring as in NIST e-Handbook §8.4.1.2; other causes as censoring (Meeker & Escobar §15).
    const r = splitLives(
      [
        { life: 900, reason: 'worn' },
        { life: 950, reason: 'failed-start' },
        { life: 400, reason: 'with-partner' },
        { life: 300, reason: 'gas-pressure' },
        { life: 350, reason: 'moisture' },
        { life: 0, reason: 'worn' },
        { life: null, reason: 'worn' },
      ],
      [250, null],
    );
    expect(r).toEqual({ failures: [900, 950], suspensions: [400, 300, 350, 250], processFaults: 2 });
  });
  it('one reason per change becomes a reason per part: the lead part keeps it, the rest came out with it', () => {
    expect(reasonsFromSingle(['electrode', 'nozzle'], 'normal-wear')).toEqual({ electrode: 'worn', nozzle: 'with-partner' });
    expect(reasonsFromSingle(['electrode', 'nozzle'], 'poor-cut')).toEqual({ electrode: 'with-partner', nozzle: 'poor-cut' });
    expect(reasonsFromSingle(['electrode', 'swirl-ring'], 'poor-cut')).toEqual({ electrode: 'poor-cut', 'swirl-ring': 'with-partner' });
    expect(reasonsFromSingle(['shield', 'nozzle'], 'damaged')).toEqual({ nozzle: 'damaged', shield: 'with-partner' });
    expect(reasonsFromSingle(['electrode', 'nozzle'], 'preventive')).toEqual({ electrode: 'preventive', nozzle: 'preventive' });
    expect(defaultReasons(['nozzle', 'electrode'])).toEqual({ electrode: 'worn', nozzle: 'with-partner' });
    expect(leadPart(['shield'])).toBe('shield');
  });
  it('fractions and states of a life bar (house thresholds 85 % and 100 %)', () => {
    expect(lifeFraction(600, 1000)).toBe(0.6);
    expect(lifeFraction(600, null)).toBeNull();
    expect([lifeState(0.5), lifeState(0.85), lifeState(1), lifeState(null)]).toEqual(['ok', 'near', 'over', 'unknown']);
  });
  it('bins lives with a round width covering the longest life', () => {
    const bins = lifeHistogram([900, 1000, 1100, 1200], [300, 500]);
    expect(bins[0].from).toBe(0);
    const width = bins[0].to - bins[0].from;
    expect([100, 200, 250, 500]).toContain(width);
    expect(bins.at(-1)!.to).toBeGreaterThanOrEqual(1200);
    expect(bins.reduce((n, b) => n + b.failures, 0)).toBe(4);
    expect(bins.reduce((n, b) => n + b.suspensions, 0)).toBe(2);
    expect(lifeHistogram([], [])).toEqual([]);
  });
});
