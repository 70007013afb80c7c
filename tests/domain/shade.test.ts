import { describe, expect, it } from 'vitest';
import { PLASMA_ARC_CUTTING_SHADES, plasmaCuttingShade, validateShadeTable, type ShadeTable } from '../../shared/domain/shade';

describe('plasmaCuttingShade: default table', () => {
  // Each row: current (A), published minimum, published suggested.
  // Minimum: OSHA 29 CFR 1910.133(a)(5), "Filter Lenses for Protection Against
  // Radiant Energy", plasma arc cutting rows: light < 300 → 8, medium 300-400 → 9,
  // heavy 400-800 → 10.
  // Suggested: ANSI Z49.1-2005 / AWS F2.2 "Guide for shade numbers", plasma arc
  // cutting: 9, 12, 14.
  const rows: [number, number, number, string][] = [
    [1, 8, 9, 'light'],
    [45, 8, 9, 'light'],
    [150, 8, 9, 'light'],
    [299.9, 8, 9, 'light'],
    [300, 9, 12, 'medium'], // "less than 300" is light, so 300 A itself is medium
    [350, 9, 12, 'medium'],
    [399.9, 9, 12, 'medium'],
    [400, 10, 14, 'heavy'], // printed in both 300-400 and 400-800; the darker row wins
    [600, 10, 14, 'heavy'],
    [800, 10, 14, 'heavy'], // top of the 400-800 row is inside the table
  ];
  it.each(rows)('%s A → minimum %s, suggested %s (%s)', (amps, minimum, suggested, band) => {
    expect(plasmaCuttingShade(amps)).toEqual({
      minimum,
      suggested,
      band,
      source: PLASMA_ARC_CUTTING_SHADES.source,
    });
  });

  it('never suggests a shade lighter than the minimum', () => {
    // OSHA 29 CFR 1910.133(a)(5) footnote *: "without going below the minimum"
    for (let amps = 1; amps <= 800; amps += 7) {
      const { minimum, suggested } = plasmaCuttingShade(amps);
      expect(suggested).toBeGreaterThanOrEqual(minimum);
    }
  });

  it('exports the table with its source and footnotes for the UI', () => {
    expect(PLASMA_ARC_CUTTING_SHADES.source).toMatch(/29 CFR 1910\.133\(a\)\(5\)/);
    expect(PLASMA_ARC_CUTTING_SHADES.source).toMatch(/ANSI Z49\.1/);
    // OSHA 29 CFR 1910.133(a)(5) footnote ** (arc hidden by the workpiece)
    expect(PLASMA_ARC_CUTTING_SHADES.notes.some((n) => /hidden by the workpiece/.test(n))).toBe(true);
    expect(() => validateShadeTable(PLASMA_ARC_CUTTING_SHADES)).not.toThrow();
  });

  it('the exported table cannot be changed by a caller', () => {
    const band = PLASMA_ARC_CUTTING_SHADES.bands[0] as { minimum: number };
    expect(() => {
      band.minimum = 3;
    }).toThrow(TypeError);
    expect(plasmaCuttingShade(100).minimum).toBe(8);
  });
});

describe('plasmaCuttingShade: bad input', () => {
  it('throws above 800 A, outside the published table', () => {
    expect(() => plasmaCuttingShade(800.1)).toThrow(/800\.1 A is above the table.*800 A/);
    expect(() => plasmaCuttingShade(1000)).toThrow(/above the table/);
  });

  it('throws for zero, negative, NaN and infinite currents', () => {
    expect(() => plasmaCuttingShade(0)).toThrow(/greater than 0 A \(got 0 A\)/);
    expect(() => plasmaCuttingShade(-40)).toThrow(/greater than 0 A/);
    expect(() => plasmaCuttingShade(Number.NaN)).toThrow(/must be a number of amperes \(got NaN\)/);
    expect(() => plasmaCuttingShade(Number.POSITIVE_INFINITY)).toThrow(/must be finite/);
    expect(() => plasmaCuttingShade('200' as unknown as number)).toThrow(/must be a number/);
  });
});

describe('plasmaCuttingShade: site override table', () => {
  // ANSI Z49.1:2012 plasma arc cutting rows split the range below 300 A:
  // < 20 → 4/4, 20-40 → 5/5, 40-60 → 6/6, 60-80 → 8/8, 80-300 → 8/9,
  // 300-400 → 9/12, 400-800 → 10/14 (minimum / suggested).
  // ANSI Z49.1:2012 table "Guide for shade numbers", as reprinted in lens
  // makers' manuals; the 40-60 row reads 6 in two reprints and 8 in a third,
  // so the test does not rely on it.
  const ansi2012: ShadeTable = {
    source: 'ANSI Z49.1:2012, Guide for shade numbers, plasma arc cutting',
    notes: [],
    bands: [
      { label: '< 20 A', fromA: 0, toA: 20, minimum: 4, suggested: 4 },
      { label: '20-40 A', fromA: 20, toA: 40, minimum: 5, suggested: 5 },
      { label: '40-60 A', fromA: 40, toA: 60, minimum: 6, suggested: 6 },
      { label: '60-80 A', fromA: 60, toA: 80, minimum: 8, suggested: 8 },
      { label: '80-300 A', fromA: 80, toA: 300, minimum: 8, suggested: 9 },
      { label: '300-400 A', fromA: 300, toA: 400, minimum: 9, suggested: 12 },
      { label: '400-800 A', fromA: 400, toA: 800, minimum: 10, suggested: 14 },
    ],
  };

  it('uses the override table and reports its source', () => {
    // ANSI Z49.1:2012, PAC 20-40 A: minimum 5, suggested 5
    expect(plasmaCuttingShade(30, ansi2012)).toEqual({
      minimum: 5,
      suggested: 5,
      band: '20-40 A',
      source: ansi2012.source,
    });
    // ANSI Z49.1:2012, PAC < 20 A: minimum 4 (the OSHA default would say 8)
    expect(plasmaCuttingShade(10, ansi2012).minimum).toBe(4);
    expect(plasmaCuttingShade(10).minimum).toBe(8);
    // Same edge rule as the default: 80 A belongs to 80-300
    expect(plasmaCuttingShade(80, ansi2012).band).toBe('80-300 A');
  });

  it('throws for a current below an override table that does not start at 0 A', () => {
    const highOnly: ShadeTable = {
      source: 'site table, heavy cutting only',
      notes: [],
      bands: [{ label: 'heavy', fromA: 400, toA: 800, minimum: 11, suggested: 14 }],
    };
    expect(() => plasmaCuttingShade(399, highOnly)).toThrow(/399 A is below the table \(starts at 400 A/);
    expect(plasmaCuttingShade(400, highOnly).minimum).toBe(11);
  });

  it('rejects malformed override tables with a message naming the problem', () => {
    const base = ansi2012.bands;
    const withBands = (bands: ShadeTable['bands']): ShadeTable => ({ ...ansi2012, bands });
    expect(() => plasmaCuttingShade(100, withBands([]))).toThrow(/at least one band/);
    expect(() => plasmaCuttingShade(100, withBands([base[0], { ...base[1], fromA: 25 }]))).toThrow(/gap between band 0 .* and band 1/);
    expect(() => plasmaCuttingShade(100, withBands([base[0], { ...base[1], fromA: 15 }]))).toThrow(/overlap between band 0/);
    expect(() => plasmaCuttingShade(100, withBands([{ ...base[0], suggested: 3 }]))).toThrow(/suggested shade 3 is lighter than minimum 4/);
    expect(() => plasmaCuttingShade(100, withBands([{ ...base[0], toA: Number.NaN }]))).toThrow(/toA must be a finite number/);
    expect(() => plasmaCuttingShade(100, withBands([{ ...base[0], toA: 0 }]))).toThrow(/toA \(0 A\) must be greater than fromA/);
    expect(() => plasmaCuttingShade(100, { ...ansi2012, source: ' ' })).toThrow(/must name its source/);
  });
});
