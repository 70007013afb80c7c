import { describe, expect, it } from 'vitest';
import { ISO_VG_GRADES, isoViscosityGradeLimits, viscosityStatus } from '../../shared/domain/viscosity';

// ISO 3448:1992 Table 1 "ISO viscosity classification", kinematic viscosity at 40 °C in mm²/s,
// transcribed here independently of the module: [grade, mid-point, min, max].
const ISO_3448_TABLE_1: [number, number, number, number][] = [
  [2, 2.2, 1.98, 2.42],
  [3, 3.2, 2.88, 3.52],
  [5, 4.6, 4.14, 5.06],
  [7, 6.8, 6.12, 7.48],
  [10, 10, 9.0, 11.0],
  [15, 15, 13.5, 16.5],
  [22, 22, 19.8, 24.2],
  [32, 32, 28.8, 35.2],
  [46, 46, 41.4, 50.6],
  [68, 68, 61.2, 74.8],
  [100, 100, 90.0, 110],
  [150, 150, 135, 165],
  [220, 220, 198, 242],
  [320, 320, 288, 352],
  [460, 460, 414, 506],
  [680, 680, 612, 748],
  [1000, 1000, 900, 1100],
  [1500, 1500, 1350, 1650],
];
// ASTM D2422-97 Table 1 adds two heavier grades to the same scheme (limits from memory, ±10 % per D2422 §4.3).
const ASTM_D2422_EXTRA: [number, number, number, number][] = [
  [2200, 2200, 1980, 2420],
  [3200, 3200, 2880, 3520],
];

describe('isoViscosityGradeLimits', () => {
  it('returns the ISO 3448 Table 1 limits for all 18 grades', () => {
    // ISO 3448:1992 Table 1 (18 grades, VG 2 to VG 1500, 1.98 to 1650 mm²/s at 40 °C).
    for (const [grade, midpoint, min, max] of ISO_3448_TABLE_1) {
      expect(isoViscosityGradeLimits(grade), `ISO VG ${grade}`).toEqual({ midpoint, min, max, standard: 'ISO 3448' });
    }
  });

  it('returns the two ASTM D2422 grades beyond ISO 3448 and labels their source', () => {
    for (const [grade, midpoint, min, max] of ASTM_D2422_EXTRA) {
      expect(isoViscosityGradeLimits(grade)).toEqual({ midpoint, min, max, standard: 'ASTM D2422' });
    }
  });

  it('every published limit is the mid-point ±10 % (ASTM D2422 §4.3; ISO 3448 uses the same rule)', () => {
    // Independent check of the literal table: limits are the mid-point × 0.9 and × 1.1 to 3 significant figures.
    for (const grade of ISO_VG_GRADES) {
      const { midpoint, min, max } = isoViscosityGradeLimits(grade);
      expect(min).toBeCloseTo(midpoint * 0.9, 6);
      expect(max).toBeCloseTo(midpoint * 1.1, 6);
    }
  });

  it('knows exactly the 20 grades, ascending', () => {
    expect(ISO_VG_GRADES).toEqual([...ISO_3448_TABLE_1, ...ASTM_D2422_EXTRA].map((r) => r[0]));
  });

  it('rejects grades that are not in the table', () => {
    expect(() => isoViscosityGradeLimits(50)).toThrow(/ISO VG 50 is not a standard grade/);
    expect(() => isoViscosityGradeLimits(4600)).toThrow(/ISO VG 4600/);
    expect(() => isoViscosityGradeLimits(Number.NaN)).toThrow(/not a standard grade/);
  });
});

describe('viscosityStatus', () => {
  it('inside, on and outside the ISO VG 46 band (41.4–50.6 mm²/s, ISO 3448 Table 1)', () => {
    expect(viscosityStatus(46, 46).band).toBe('within');
    // Limits are inclusive: 41.4 and 50.6 still meet VG 46.
    expect(viscosityStatus(41.4, 46)).toMatchObject({ band: 'within', withinGrade: true });
    expect(viscosityStatus(50.6, 46).band).toBe('within');
    expect(viscosityStatus(41.3, 46)).toMatchObject({ band: 'below', withinGrade: false });
    expect(viscosityStatus(50.7, 46)).toMatchObject({ band: 'above', withinGrade: false });
  });

  it('reports the deviation from the mid-point (hand-worked)', () => {
    // (61.2 − 68) / 68 = −0.1 exactly: the VG 68 minimum.
    expect(viscosityStatus(61.2, 68).deviation).toBeCloseTo(-0.1, 12);
    // (35.2 − 32) / 32 = +0.1: the VG 32 maximum.
    expect(viscosityStatus(35.2, 32).deviation).toBeCloseTo(0.1, 12);
  });

  it('warnFraction marks in-band drift as near-limit (hand-worked, house rule)', () => {
    // VG 46, warn at 5 %: 43.5 is −5.4 % (near-limit), 44 is −4.3 % (within), 48.5 is +5.4 % (near-limit).
    expect(viscosityStatus(43.5, 46, { warnFraction: 0.05 })).toMatchObject({ band: 'near-limit', withinGrade: true });
    expect(viscosityStatus(44, 46, { warnFraction: 0.05 }).band).toBe('within');
    expect(viscosityStatus(48.5, 46, { warnFraction: 0.05 }).band).toBe('near-limit');
    // Outside the grade stays 'below'/'above' whatever the warn setting.
    expect(viscosityStatus(40, 46, { warnFraction: 0.05 }).band).toBe('below');
  });

  it('rejects bad input with clear messages', () => {
    expect(() => viscosityStatus(-3, 46)).toThrow(/positive number of mm²\/s/);
    expect(() => viscosityStatus(Number.NaN, 46)).toThrow(/positive number/);
    expect(() => viscosityStatus(46, 45)).toThrow(/ISO VG 45 is not a standard grade/);
    expect(() => viscosityStatus(46, 46, { warnFraction: 0.2 })).toThrow(/warnFraction must be greater than 0 and less than 0.10/);
    expect(() => viscosityStatus(46, 46, { warnFraction: 0 })).toThrow(/warnFraction/);
  });
});
