import { describe, expect, it } from 'vitest';
import { cleanlinessVerdict, iso4406Code, parseIso4406Code } from '../../shared/domain/cleanliness';
import { viscosityChange } from '../../shared/domain/viscosity';

describe('cleanlinessVerdict: ISO 4406 steps over target (caution 1, action 2: common practice)', () => {
  it('at or under target on every size is within', () => {
    expect(cleanlinessVerdict('17/15/12', '17/15/12').verdict).toBe('within');
    expect(cleanlinessVerdict('16/14/11', '17/15/12').verdict).toBe('within');
  });

  it('one step over on any size is a caution, not an action', () => {
    // One ISO 4406 step is about a doubling of the count (ISO 4406:2021 §4.1); common practice treats it as a caution
    const r = cleanlinessVerdict('17/16/12', '17/15/12');
    expect(r.verdict).toBe('caution');
    expect(r.worstStepsOver).toBe(1);
  });

  it('two or more steps over on any size is an action', () => {
    // common practice
    expect(cleanlinessVerdict('17/15/14', '17/15/12').verdict).toBe('action');
    expect(cleanlinessVerdict('20/15/12', '17/15/12').worstStepsOver).toBe(3);
  });

  it('counts from a lab report turn into the verdict through the ISO 4406 table', () => {
    // ISO 4406:2021 Table 1: 2 000/mL → 18 (1 300–2 500), 400/mL → 16 (320–640), 30/mL → 12 (20–40)
    expect(iso4406Code({ ge4um: 2000, ge6um: 400, ge14um: 30 })).toBe('18/16/12');
    expect(cleanlinessVerdict(iso4406Code({ ge4um: 2000, ge6um: 400, ge14um: 30 }), '17/15/12').verdict).toBe('caution');
    // 700/mL at ≥6 µm → 17: two steps over 15
    expect(cleanlinessVerdict(iso4406Code({ ge4um: 2000, ge6um: 700, ge14um: 30 }), '17/15/12').verdict).toBe('action');
  });

  it('a target with an unreported size ("-/15/12") judges only the sizes it names', () => {
    // ISO 4406:2021 §4: "-" where a size is not reported
    expect(parseIso4406Code('-/15/12').ge4um.scale).toBeNull();
    expect(cleanlinessVerdict('23/15/12', '-/15/12').verdict).toBe('within');
    expect(cleanlinessVerdict('23/17/12', '-/15/12').verdict).toBe('action');
  });

  it('steps are settable per shop', () => {
    expect(cleanlinessVerdict('17/16/12', '17/15/12', { caution: 2, action: 3 }).verdict).toBe('within');
    expect(cleanlinessVerdict('17/17/12', '17/15/12', { caution: 1, action: 3 }).verdict).toBe('caution');
    expect(() => cleanlinessVerdict('17/16/12', '17/15/12', { caution: 3, action: 2 })).toThrow(/caution ≤ action/);
  });

  it('a bad code is refused naming the part', () => {
    expect(() => cleanlinessVerdict('17/15/12', '17/x/12')).toThrow(/part 2/);
  });
});

describe('viscosityChange: against the new-oil baseline (±10 % caution, ±20 % action: common practice)', () => {
  it('gives the change in percent of the baseline', () => {
    // hand-worked: (50.6 − 46) / 46 = +10 %
    expect(viscosityChange(50.6, 46).changePercent).toBeCloseTo(10, 10);
    expect(viscosityChange(41.4, 46).changePercent).toBeCloseTo(-10, 10);
  });

  it('within under 10 %, caution from 10 %, action from 20 % either way', () => {
    expect(viscosityChange(48, 46).verdict).toBe('within');
    expect(viscosityChange(50.6, 46).verdict).toBe('caution');
    expect(viscosityChange(41.4, 46).verdict).toBe('caution');
    expect(viscosityChange(55.2, 46).verdict).toBe('action');
    expect(viscosityChange(36, 46).verdict).toBe('action');
  });

  it('judges against the oil as delivered, not the ISO VG band', () => {
    // A VG 46 oil delivered at 43.0 mm²/s (inside ISO 3448's 41.4–50.6) that reads 50.0 has thickened 16 %:
    // a caution, though 50.0 is still inside the VG 46 band.
    expect(viscosityChange(50, 43).verdict).toBe('caution');
  });

  it('limits are settable per shop; bad values are refused', () => {
    expect(viscosityChange(50.6, 46, { cautionPercent: 15, actionPercent: 25 }).verdict).toBe('within');
    expect(() => viscosityChange(0, 46)).toThrow(/measuredCst/);
    expect(() => viscosityChange(46, -1)).toThrow(/baselineCst/);
    expect(() => viscosityChange(46, 46, { cautionPercent: 20, actionPercent: 10 })).toThrow(/cautionPercent ≤ actionPercent/);
  });
});
