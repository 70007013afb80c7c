import { describe, expect, it } from 'vitest';
import { dailyDoseAcrossTasks, impulsePeakExceeded, noiseDosePercent, noiseVerdicts, protectedExposureDbA, twaFromDose } from '../../shared/domain/noise';

describe('noiseDosePercent by basis: OSHA 29 CFR 1910.95 App. A', () => {
  // A 12-hour shift: 8 h at 90 dBA and 4 h at 85 dBA.
  const shift = [
    { levelDbA: 90, hours: 8 },
    { levelDbA: 85, hours: 4 },
  ];

  it('the hearing-conservation basis (80–130 dBA, the default) counts the 85 dBA hours', () => {
    // OSHA 29 CFR 1910.95 App. A with Table G-16a (90 → 8 h, 85 → 16 h): D = 100 (8/8 + 4/16) = 125 %
    expect(noiseDosePercent(shift)).toBeCloseTo(125, 10);
    expect(noiseDosePercent(shift, { basis: 'hearing-conservation' })).toBeCloseTo(125, 10);
    // App. A, I(2): TWA = 16.61 log10(1.25) + 90 = 91.6 dBA
    expect(twaFromDose(125)).toBeCloseTo(91.61, 2);
  });

  it('the PEL basis (90–140 dBA) leaves out levels under 90 dBA: the same shift is at the PEL, not over it', () => {
    // OSHA 29 CFR 1910.95(b)(1) and App. A: only 90–140 dBA is integrated for the PEL → D = 100 (8/8) = 100 %
    expect(noiseDosePercent(shift, { basis: 'pel' })).toBeCloseTo(100, 10);
    const v = noiseVerdicts(shift);
    // App. A, I(2) / Table A-1: 100 % → 90 dBA; 1910.95(b)(1) "exceeds" is strict, so at the limit is not over it
    expect(v.pel.twaDbA).toBeCloseTo(90, 6);
    expect(v.pel.reached).toBe(false);
    // 1910.95(c)(1): TWA ≥ 85 dBA (dose ≥ 50 %) → hearing conservation program
    expect(v.actionLevel.twaDbA).toBeCloseTo(91.61, 2);
    expect(v.actionLevel.reached).toBe(true);
    expect(v.pel.source).toMatch(/1910\.95\(b\)/);
    expect(v.actionLevel.source).toMatch(/1910\.95\(c\)\(1\)/);
  });

  it('exactly 90 dBA counts for the PEL; 89.9 dBA does not', () => {
    // OSHA 29 CFR 1910.95 App. A: 90 to 140 dBA integrated for the PEL
    expect(noiseDosePercent([{ levelDbA: 89.9, hours: 8 }], { basis: 'pel' })).toBe(0);
    expect(noiseDosePercent([{ levelDbA: 90, hours: 4 }], { basis: 'pel' })).toBeCloseTo(50, 10);
    // 135 dBA: T = 8 / 2^9 = 0.015625 h (App. A footnote formula); 0.01 h → 64 %
    expect(noiseDosePercent([{ levelDbA: 135, hours: 0.01 }], { basis: 'pel' })).toBeCloseTo(64, 8);
  });

  it('a PEL dose over 100 % is over the PEL', () => {
    // 1910.95(b)(1): 4 h at 95 dBA (T = 4 h) + 4 h at 90 dBA (T = 8 h) → 150 %, TWA 92.9 dBA
    const v = noiseVerdicts([
      { levelDbA: 95, hours: 4 },
      { levelDbA: 90, hours: 4 },
    ]);
    expect(v.pel.dosePercent).toBeCloseTo(150, 10);
    expect(v.pel.reached).toBe(true);
  });

  it('an unknown basis is refused', () => {
    expect(() => noiseDosePercent([], { basis: 'weekly' as never })).toThrow(/basis/);
  });
});

describe('impulsePeakExceeded: OSHA 29 CFR 1910.95(b)(2)', () => {
  it('over 140 dB peak is exceeded; exactly 140 is not', () => {
    // 1910.95(b)(2): impulsive or impact noise "should not exceed 140 dB peak sound pressure level"
    expect(impulsePeakExceeded(140)).toBe(false);
    expect(impulsePeakExceeded(140.1)).toBe(true);
    expect(impulsePeakExceeded(128)).toBe(false);
    expect(() => impulsePeakExceeded(Number.NaN)).toThrow(/peak level/);
  });
});

describe('protectedExposureDbA: OSHA 29 CFR 1910.95 App. B', () => {
  it('A-weighted TWA: TWA − (NRR − 7)', () => {
    // App. B, A-weighted methods: subtract 7 dB from the NRR, then from the TWA. Hand-worked: 100 − (29 − 7) = 78
    expect(protectedExposureDbA(100, 29)).toBe(78);
    expect(protectedExposureDbA(95, 25)).toBe(77);
  });

  it('derated: TWA − (NRR − 7) / 2', () => {
    // OSHA Technical Manual Sec. III Ch. 5, 50 % correction (from memory): 100 − 22 / 2 = 89
    expect(protectedExposureDbA(100, 29, { derate: true })).toBe(89);
  });

  it('C-weighted TWA: TWA − NRR', () => {
    // App. B, C-weighted methods: 100 − 29 = 71
    expect(protectedExposureDbA(100, 29, { weighting: 'C' })).toBe(71);
  });

  it('no credit for an NRR under 7 on an A-weighted TWA; a negative NRR is refused', () => {
    expect(protectedExposureDbA(92, 5)).toBe(92);
    expect(() => protectedExposureDbA(92, -1)).toThrow(/NRR/);
  });
});

describe('dailyDoseAcrossTasks: App. A sum of partial doses', () => {
  it('adds the partial doses of tasks at two machines', () => {
    // App. A, I(1)(ii): punch 4 h at 95 dBA (T 4 h) = 100 %; plasma 3 h at 90 dBA (T 8 h) = 37.5 %,
    // plus 1 h at 85 dBA (T 16 h) = 6.25 % on the hearing-conservation basis only.
    const day = dailyDoseAcrossTasks([
      { label: 'P1 punching', exposures: [{ levelDbA: 95, hours: 4 }] },
      {
        label: 'T2 plasma cutting',
        exposures: [
          { levelDbA: 90, hours: 3 },
          { levelDbA: 85, hours: 1 },
        ],
      },
    ]);
    expect(day.tasks.map((t) => t.actionLevelDosePercent)).toEqual([100, 43.75]);
    expect(day.tasks.map((t) => t.pelDosePercent)).toEqual([100, 37.5]);
    expect(day.actionLevel.dosePercent).toBeCloseTo(143.75, 10);
    expect(day.pel.dosePercent).toBeCloseTo(137.5, 10);
    expect(day.pel.reached).toBe(true);
  });

  it('refuses a day of more than 24 hours across tasks', () => {
    expect(() =>
      dailyDoseAcrossTasks([
        { label: 'a', exposures: [{ levelDbA: 90, hours: 16 }] },
        { label: 'b', exposures: [{ levelDbA: 90, hours: 10 }] },
      ]),
    ).toThrow(/24 hours/);
  });
});
