import { describe, expect, it } from 'vitest';
import { canonicalUnit, convertUnit, UnitError } from '../../shared/domain/units';

describe('convertUnit: NIST SP 811 (2008) App. B', () => {
  it('pressure factors to pascals', () => {
    // NIST SP 811 App. B.8: psi = 6.894 757 E+03 Pa; bar = 1.0 E+05 Pa; inch of water (39.2 °F) = 2.490 82 E+02 Pa
    expect(convertUnit(1, 'psi', 'Pa')).toBeCloseTo(6894.757, 6);
    expect(convertUnit(1, 'bar', 'Pa')).toBe(100_000);
    expect(convertUnit(1, 'inH2O', 'Pa')).toBeCloseTo(249.082, 6);
    expect(convertUnit(250, 'Pa', 'kPa')).toBeCloseTo(0.25, 12);
  });

  it('between non-SI units through pascals', () => {
    // 1 bar / 6 894.757 Pa = 14.503 77 psi (NIST SP 811 factors, worked by hand)
    expect(convertUnit(1, 'bar', 'psi')).toBeCloseTo(14.50377, 5);
    // 10 inH2O = 2 490.82 Pa = 0.361 26 psi
    expect(convertUnit(10, 'inH2O', 'psi')).toBeCloseTo(2490.82 / 6894.757, 10);
    expect(convertUnit(convertUnit(3.7, 'psi', 'kPa'), 'kPa', 'psi')).toBeCloseTo(3.7, 12);
  });

  it('temperature: t/°C = (t/°F − 32) / 1.8', () => {
    // NIST SP 811 §4.2.1.1 / App. B.9: 212 °F = 100 °C, 32 °F = 0 °C, −40 °F = −40 °C, 140 °F = 60 °C
    expect(convertUnit(212, '°F', '°C')).toBeCloseTo(100, 12);
    expect(convertUnit(32, '°F', '°C')).toBe(0);
    expect(convertUnit(-40, '°F', '°C')).toBeCloseTo(-40, 12);
    expect(convertUnit(60, '°C', '°F')).toBeCloseTo(140, 12);
  });

  it('accepts the usual spellings', () => {
    expect(canonicalUnit('in H2O')).toBe('inH2O');
    expect(canonicalUnit('PSI')).toBe('psi');
    expect(canonicalUnit('degF')).toBe('°F');
    expect(convertUnit(2, 'KPA', 'Pa')).toBe(2000);
  });

  it('the same unit passes through, even one not known here', () => {
    expect(convertUnit(184_220, 'starts', 'starts')).toBe(184_220);
  });

  it('refuses an unknown unit and a conversion across quantities', () => {
    expect(() => convertUnit(1, 'furlong', 'Pa')).toThrow(UnitError);
    expect(() => convertUnit(1, 'furlong', 'Pa')).toThrow(/Unknown unit “furlong”/);
    expect(() => convertUnit(1, 'psi', '°C')).toThrow(/pressure.*temperature/);
    expect(() => convertUnit(1, 'starts', 'hits')).toThrow(/Unknown unit “starts”/);
  });
});
