import { describe, it, expect } from 'vitest';
import jStat from 'jstat';
import { demandStats, packedOrderQuantity, reorderPoint, reorderPointUnits, serviceLevelZ, suggestedOrder } from '../../shared/domain/stock';

describe('serviceLevelZ (standard normal quantile)', () => {
  // NIST e-Handbook of Statistical Methods §1.3.6.7.2, table of upper critical values
  // of Student's t, row ν = ∞ (= standard normal): upper-tail 0.10 → 1.282, 0.05 → 1.645,
  // 0.025 → 1.960, 0.01 → 2.326, 0.005 → 2.576, 0.001 → 3.090. Printed to 3 decimals → ±0.0005.
  const table: Array<[number, number]> = [
    [0.9, 1.282],
    [0.95, 1.645],
    [0.975, 1.96],
    [0.99, 2.326],
    [0.995, 2.576],
    [0.999, 3.09],
  ];
  for (const [level, z] of table) {
    it(`service level ${level} → z = ${z}`, () => {
      expect(Math.abs(serviceLevelZ(level) - z)).toBeLessThan(0.0005);
    });
  }

  it('is symmetric about 0.5 and inverts the normal CDF', () => {
    // Φ(−z) = 1 − Φ(z) (any normal table); jstat's own CDF closes the loop.
    expect(serviceLevelZ(0.5)).toBeCloseTo(0, 12);
    expect(serviceLevelZ(0.05)).toBeCloseTo(-serviceLevelZ(0.95), 9);
    expect(jStat.normal.cdf(serviceLevelZ(0.97), 0, 1)).toBeCloseTo(0.97, 9);
  });
});

describe('reorderPoint', () => {
  it('textbook example, σ given over the lead time: 350 + 1.65·10 ≈ 366.5 (from memory)', () => {
    // Operations-management text, reorder point with probabilistic demand (from memory):
    // mean demand during the reorder period 350, σ during it 10, 95 % service level,
    // z = 1.65 from the table → safety stock 16.5, ROP = 366.5. Expressed here as a 1-day
    // lead time. Exact z = 1.6449 gives 366.449; tolerance covers the table's rounding of z.
    const rop = reorderPoint({ dailyDemandMean: 350, dailyDemandSd: 10, leadTimeDays: 1, serviceLevel: 0.95 });
    expect(Math.abs(rop - 366.5)).toBeLessThan(0.06);
  });

  it('textbook example, σ per day: 15·2 + 1.28·5·√2 ≈ 39 (from memory)', () => {
    // Operations-management text, constant lead time with variable daily demand (from memory):
    // d̄ = 15/day, σd = 5/day, L = 2 days, 90 % service level, z = 1.28 →
    // ROP = 30 + 1.28·5·1.414 = 30 + 9.05 ≈ 39.05 (the text rounds to 39).
    // Exact z = 1.2816 gives 39.062; tolerance covers z rounded to 2 decimals.
    const rop = reorderPoint({ dailyDemandMean: 15, dailyDemandSd: 5, leadTimeDays: 2, serviceLevel: 0.9 });
    expect(Math.abs(rop - 39.05)).toBeLessThan(0.02);
  });

  it('adds z·σ·√L to mean lead-time demand, with z from the NIST table', () => {
    // z(0.99) = 2.326 (NIST §1.3.6.7.2, ν = ∞). d̄ = 4, σ = 1.5, L = 9 days:
    // 36 + 2.326·1.5·3 = 36 + 10.467 = 46.467 (±0.0005·4.5 from z's rounding).
    const rop = reorderPoint({ dailyDemandMean: 4, dailyDemandSd: 1.5, leadTimeDays: 9, serviceLevel: 0.99 });
    expect(Math.abs(rop - 46.467)).toBeLessThan(0.003);
  });

  it('with no demand variability the reorder point is just lead-time demand', () => {
    expect(reorderPoint({ dailyDemandMean: 3, dailyDemandSd: 0, leadTimeDays: 7, serviceLevel: 0.99 })).toBe(21);
  });

  it('grows with the service level', () => {
    const base = { dailyDemandMean: 2, dailyDemandSd: 1, leadTimeDays: 10 };
    const at90 = reorderPoint({ ...base, serviceLevel: 0.9 });
    const at99 = reorderPoint({ ...base, serviceLevel: 0.99 });
    expect(at99).toBeGreaterThan(at90);
  });
});

describe('reorderPointUnits', () => {
  it('rounds up to whole parts', () => {
    // 39.06 from the textbook example above → 40 parts.
    expect(reorderPointUnits({ dailyDemandMean: 15, dailyDemandSd: 5, leadTimeDays: 2, serviceLevel: 0.9 })).toBe(40);
  });

  it('does not add a part for float noise on a whole number', () => {
    // 2.2 · 25 = 55.00000000000001 in binary floating point; the answer is 55 parts.
    expect(2.2 * 25).toBeGreaterThan(55);
    expect(reorderPointUnits({ dailyDemandMean: 2.2, dailyDemandSd: 0, leadTimeDays: 25, serviceLevel: 0.95 })).toBe(55);
  });

  it('never goes below zero parts', () => {
    expect(reorderPointUnits({ dailyDemandMean: 0, dailyDemandSd: 2, leadTimeDays: 4, serviceLevel: 0.2 })).toBe(0);
  });
});

describe('demandStats', () => {
  it('uses the sample (n − 1) standard deviation, matching jstat', () => {
    // Hand check: usage 2, 4, 4, 4, 5, 5, 7, 9 → mean 5, Σ(x − x̄)² = 32,
    // sample variance 32/7, sd = √(32/7) ≈ 2.138 (population sd would be 2).
    const usage = [2, 4, 4, 4, 5, 5, 7, 9];
    const stats = demandStats(usage);
    expect(stats.mean).toBe(5);
    expect(stats.sd).toBeCloseTo(Math.sqrt(32 / 7), 12);
    expect(stats.sd).toBeCloseTo(jStat.stdev(usage, true), 12);
  });

  it('rejects fewer than 2 days, NaN and negative usage', () => {
    expect(() => demandStats([])).toThrow(/at least 2 days/);
    expect(() => demandStats([3])).toThrow(/at least 2 days/);
    expect(() => demandStats([3, Number.NaN])).toThrow(/dailyUsage\[1\]/);
    expect(() => demandStats([3, -1])).toThrow(/dailyUsage\[1\]/);
  });
});

describe('bad input', () => {
  const ok = { dailyDemandMean: 2, dailyDemandSd: 1, leadTimeDays: 5, serviceLevel: 0.95 };

  it('rejects service levels outside (0, 1)', () => {
    for (const serviceLevel of [0, 1, -0.5, 1.2, 95, Number.NaN]) {
      expect(() => reorderPoint({ ...ok, serviceLevel })).toThrow(/serviceLevel/);
    }
    expect(() => serviceLevelZ(1)).toThrow(/serviceLevel/);
  });

  it('rejects negative or non-finite demand and lead time, naming the field', () => {
    expect(() => reorderPoint({ ...ok, dailyDemandMean: -1 })).toThrow(/dailyDemandMean/);
    expect(() => reorderPoint({ ...ok, dailyDemandSd: Number.NaN })).toThrow(/dailyDemandSd/);
    expect(() => reorderPoint({ ...ok, leadTimeDays: -2 })).toThrow(/leadTimeDays/);
    expect(() => reorderPoint({ ...ok, leadTimeDays: Number.POSITIVE_INFINITY })).toThrow(/leadTimeDays/);
    expect(() => reorderPointUnits({ ...ok, dailyDemandMean: Number.NaN })).toThrow(/dailyDemandMean/);
  });
});

describe('reorderPoint with a varying lead time: d·L + z·√(L·σd² + d²·σL²)', () => {
  it('hand-worked: d 20, σd 4, L 10, σL 2, 95 % → 200 + 1.6449·√1760 = 269.005', () => {
    // √(10·4² + 20²·2²) = √(160 + 1600) = 41.952; z(0.95) = 1.645 (NIST §1.3.6.7.2 table, above).
    // SciPy: 200 + stats.norm.ppf(0.95)*math.sqrt(1760) = 269.0054815156588.
    const rop = reorderPoint({ dailyDemandMean: 20, dailyDemandSd: 4, leadTimeDays: 10, leadTimeSdDays: 2, serviceLevel: 0.95 });
    expect(Math.abs(rop - 269.0054815156588)).toBeLessThan(1e-6);
    // With the table's z = 1.645 by hand: 200 + 1.645·41.952 = 269.01.
    expect(Math.abs(rop - 269.01)).toBeLessThan(0.01);
  });

  it('hand-worked: d 3, σd 1.5, L 5, σL 2, 99 % → 15 + 2.3263·√47.25 = 30.991', () => {
    // SciPy: 15 + stats.norm.ppf(0.99)*math.sqrt(5*1.5**2 + 9*2**2) = 30.99099783838762.
    const rop = reorderPoint({ dailyDemandMean: 3, dailyDemandSd: 1.5, leadTimeDays: 5, leadTimeSdDays: 2, serviceLevel: 0.99 });
    expect(Math.abs(rop - 30.99099783838762)).toBeLessThan(1e-6);
  });

  it('leaving out σL or giving 0 is the fixed-lead-time formula; more lead-time spread raises it', () => {
    const base = { dailyDemandMean: 4, dailyDemandSd: 1.5, leadTimeDays: 9, serviceLevel: 0.99 };
    expect(reorderPoint({ ...base, leadTimeSdDays: 0 })).toBe(reorderPoint(base));
    expect(reorderPoint({ ...base, leadTimeSdDays: 1 })).toBeGreaterThan(reorderPoint(base));
    expect(() => reorderPoint({ ...base, leadTimeSdDays: -1 })).toThrow(/leadTimeSdDays/);
  });
});

describe('packedOrderQuantity and suggestedOrder (common practice: whole packs, at least the minimum order)', () => {
  it('rounds a shortfall up to whole packs', () => {
    expect(packedOrderQuantity(7, 5)).toBe(10);
    expect(packedOrderQuantity(10, 5)).toBe(10);
    expect(packedOrderQuantity(10.000000001, 5)).toBe(10);
    expect(packedOrderQuantity(0, 5)).toBe(0);
  });
  it('orders at least the minimum, itself in whole packs', () => {
    expect(packedOrderQuantity(3, 5, 12)).toBe(15);
    expect(packedOrderQuantity(3, 1, 12)).toBe(12);
  });
  it('refuses a pack size of 0', () => {
    expect(() => packedOrderQuantity(3, 0)).toThrow(/packSize/);
  });
  it('covers use over the horizon plus the reorder point, less on hand and on order', () => {
    // 30 to use + 8 to keep − 10 on hand − 5 on order = 23 short → 3 packs of 10.
    expect(suggestedOrder({ expectedUse: 30, reorderPoint: 8, onHand: 10, onOrder: 5, packSize: 10 })).toEqual({ shortfall: 23, quantity: 30 });
    expect(suggestedOrder({ expectedUse: 3, reorderPoint: 2, onHand: 10, onOrder: 0, packSize: 10 })).toEqual({ shortfall: 0, quantity: 0 });
  });
});
