import { describe, it, expect } from 'vitest';
import jStat from 'jstat';
import { forecastReach, usageRatePerDay } from '../../shared/domain/forecast';

const DAY = 86_400_000;
const T0 = Date.UTC(2024, 0, 1, 6, 0, 0);
const at = (days: number) => new Date(T0 + days * DAY);

// Hand-worked OLS example (formula: NIST e-Handbook §4.4.3.1, b = Sxy/Sxx, a = ȳ − b·x̄).
// Arc-start meter read at days x = 0, 1, 2, 4 with values y = 100, 130, 150, 210.
//   x̄ = 7/4 = 1.75                 ȳ = 590/4 = 147.5
//   x − x̄ = −1.75, −0.75, 0.25, 2.25
//   y − ȳ = −47.5, −17.5, 2.5, 62.5
//   Sxy = 83.125 + 13.125 + 0.625 + 140.625 = 237.5
//   Sxx = 3.0625 + 0.5625 + 0.0625 + 5.0625 = 8.75
//   b = 237.5 / 8.75 = 190/7 ≈ 27.142857 per day
//   a = 147.5 − (190/7)·1.75 = 147.5 − 47.5 = 100
// So y = 100 + (190/7)·x; it reaches 300 at x = 200·7/190 = 1400/190 ≈ 7.368421 days.
const HAND = [
  { at: at(0), value: 100 },
  { at: at(1), value: 130 },
  { at: at(2), value: 150 },
  { at: at(4), value: 210 },
];

describe('usageRatePerDay', () => {
  it('matches the hand-worked least-squares slope 190/7 per day', () => {
    expect(usageRatePerDay(HAND)).toBeCloseTo(190 / 7, 10);
  });

  it('matches jstat: slope = sample covariance(x, y) / sample variance(x)', () => {
    // Irregular reading times (hours) and noisy values; jstat computes the same OLS
    // slope from its own covariance and variance routines.
    const hours = [0, 7.5, 20, 31, 49, 50.25, 73, 96, 130, 161];
    const values = [12, 19, 41, 52, 80, 83, 118, 150, 199, 247];
    const readings = hours.map((h, i) => ({ at: new Date(T0 + h * 3_600_000), value: values[i] }));
    const days = hours.map((h) => h / 24);
    const expected = jStat.covariance(days, values) / jStat.variance(days, true);
    expect(usageRatePerDay(readings)).toBeCloseTo(expected, 9);
  });

  it('does not depend on the order readings arrive in', () => {
    const shuffled = [HAND[2], HAND[0], HAND[3], HAND[1]];
    expect(usageRatePerDay(shuffled)).toBeCloseTo(190 / 7, 10);
  });

  it('is null with fewer than 2 distinct reading times', () => {
    expect(usageRatePerDay([])).toBeNull();
    expect(usageRatePerDay([{ at: at(0), value: 5 }])).toBeNull();
    expect(
      usageRatePerDay([
        { at: at(3), value: 5 },
        { at: at(3), value: 9 },
      ]),
    ).toBeNull();
  });
});

describe('forecastReach', () => {
  it('projects from the latest reading along the hand-worked slope: day 4 + 90/(190/7)', () => {
    // Latest reading 210 at day 4; 90 to go at 190/7 per day (NIST §4.4.3.1 slope, worked above) → day 4 + 630/190.
    // (Starting from the fitted line instead gave day 1400/190 ≈ 7.37, 0.05 d later: the line sits below the reading.)
    const when = forecastReach(HAND, 300);
    expect(when).not.toBeNull();
    // A Date holds whole milliseconds, so allow 1 ms.
    expect(Math.abs(when!.getTime() - (T0 + (4 + 630 / 190) * DAY))).toBeLessThanOrEqual(1);
  });

  it('returns null for a flat meter', () => {
    const flat = [0, 1, 2, 3].map((d) => ({ at: at(d), value: 500 }));
    expect(forecastReach(flat, 600)).toBeNull();
  });

  it('returns null for a decreasing fit', () => {
    const falling = [
      { at: at(0), value: 300 },
      { at: at(1), value: 280 },
      { at: at(2), value: 290 },
      { at: at(3), value: 250 },
    ];
    expect(forecastReach(falling, 400)).toBeNull();
  });

  it('returns null with fewer than 2 distinct times when the target is not yet reached', () => {
    expect(forecastReach([], 10)).toBeNull();
    expect(forecastReach([{ at: at(0), value: 5 }], 10)).toBeNull();
  });

  describe('target already reached (latest reading ≥ target): when the readings reached it', () => {
    it('interpolates between the two readings around the crossing', () => {
      // 150 at day 2, 210 at day 4: 200 is 50/60 of the way → day 2 + 5/3 (linear interpolation, worked by hand)
      const when = forecastReach(HAND, 200)!;
      expect(Math.abs(when.getTime() - (T0 + (2 + 5 / 3) * DAY))).toBeLessThanOrEqual(1);
    });

    it('takes the latest run at or above the target', () => {
      // 0 at day 1, 100 at day 2: 90 is reached at day 1.9 (worked by hand)
      const jump = [
        { at: at(0), value: 0 },
        { at: at(1), value: 0 },
        { at: at(2), value: 100 },
      ];
      expect(forecastReach(jump, 90)!.getTime()).toBe(T0 + 1.9 * DAY);
    });

    it('returns the first reading when every reading is already past the target', () => {
      expect(forecastReach([{ at: at(5), value: 900 }], 800)!.getTime()).toBe(at(5).getTime());
      const flat = [0, 1, 2].map((d) => ({ at: at(d), value: 500 }));
      expect(forecastReach(flat, 400)!.getTime()).toBe(at(0).getTime());
    });
  });

  it('returns null when the date would fall outside what a Date can hold', () => {
    // A barely moving meter: 1e-9 units per day would need ~1e18 days to reach the target.
    const crawl = [
      { at: at(0), value: 0 },
      { at: at(1), value: 1e-9 },
    ];
    expect(forecastReach(crawl, 1e9)).toBeNull();
  });
});

describe('bad input', () => {
  it('throws on a NaN or infinite value, naming the reading', () => {
    expect(() =>
      forecastReach(
        [
          { at: at(0), value: 1 },
          { at: at(1), value: Number.NaN },
        ],
        10,
      ),
    ).toThrow(/readings\[1\]\.value/);
    expect(() => usageRatePerDay([{ at: at(0), value: Number.POSITIVE_INFINITY }])).toThrow(/readings\[0\]\.value/);
  });

  it('throws on an invalid Date or a non-Date', () => {
    expect(() => forecastReach([{ at: new Date('not a date'), value: 1 }], 10)).toThrow(/readings\[0\]\.at must be a valid Date/);
    const notADate = [{ at: '2024-01-01' as unknown as Date, value: 1 }];
    expect(() => usageRatePerDay(notADate)).toThrow(/valid Date/);
  });

  it('throws on a NaN target', () => {
    expect(() => forecastReach(HAND, Number.NaN)).toThrow(/target/);
  });
});
