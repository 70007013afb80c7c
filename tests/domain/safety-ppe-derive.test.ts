import { describe, it, expect } from 'vitest';
import { deriveHearing, deriveRequiredItems, deriveShade } from '../../shared/schemas/safety-ppe-derive';

const site = { shadeTable: null, hearingRequiredFromDbA: 85, hearingRuleSource: 'test rule' };

describe('filter-lens shade from the arc current', () => {
  it('follows the OSHA plasma arc cutting rows', () => {
    // OSHA 29 CFR 1910.133(a)(5): light (< 300 A) minimum 8; medium (300-400 A) 9; heavy (400-800 A) 10.
    expect(deriveShade(130, null)).toMatchObject({ ok: true, minimum: 8, suggested: 9 });
    expect(deriveShade(300, null)).toMatchObject({ ok: true, minimum: 9, suggested: 12 });
    expect(deriveShade(400, null)).toMatchObject({ ok: true, minimum: 10, suggested: 14 });
    expect(deriveShade(null, null)).toBeNull();
  });
  it('reports a current above the table instead of guessing', () => {
    const r = deriveShade(900, null);
    expect(r).toMatchObject({ ok: false, arcCurrentA: 900 });
    expect(r && !r.ok ? r.message : '').toMatch(/above the table/);
  });
});

describe('hearing protection from the noise dose', () => {
  it('computes dose and TWA as 29 CFR 1910.95 App. A does', () => {
    // 8 h at 90 dBA: T = 8 h, D = 100 %, TWA = 90 dBA (Table A-1).
    expect(deriveHearing([{ levelDbA: 90, hours: 8 }], site)).toMatchObject({ dosePercent: 100, twaDbA: 90, required: true });
    // 8 h at 85 dBA: D = 50 %, TWA = 85 dBA, exactly the action level (1910.95(c)(1)).
    expect(deriveHearing([{ levelDbA: 85, hours: 8 }], site)).toMatchObject({ dosePercent: 50, twaDbA: 85, required: true });
    // 8 h at 84 dBA: below 85, not required by the default rule …
    expect(deriveHearing([{ levelDbA: 84, hours: 8 }], site)?.required).toBe(false);
    // … but required where the site follows an 80 dBA rule.
    expect(deriveHearing([{ levelDbA: 84, hours: 8 }], { ...site, hearingRequiredFromDbA: 80 })?.required).toBe(true);
  });
  it('leaves levels below 80 dBA out of the dose (1910.95(d)(2)(i))', () => {
    expect(deriveHearing([{ levelDbA: 75, hours: 8 }], site)).toMatchObject({ dosePercent: 0, twaDbA: null, required: false });
    expect(deriveHearing([], site)).toBeNull();
  });
});

describe('required items', () => {
  it('adds the filter lens and hearing protection where the arc and the noise call for them', () => {
    const r = deriveRequiredItems({ items: ['safety-glasses'], otherItems: ['Leather apron'], arcCurrentA: 130, noise: [{ levelDbA: 92, hours: 6 }] }, site);
    expect(r.required.map((i) => i.code)).toEqual(['safety-glasses', 'filter-lens', 'hearing-protection', 'other:Leather apron']);
    expect(r.required.find((i) => i.code === 'filter-lens')?.detail).toBe('Shade 8 or darker at 130 A (suggested 9)');
    expect(r.required.find((i) => i.code === 'hearing-protection')?.source).toContain('test rule');
  });
  it('asks for nothing extra without an arc or noise', () => {
    const r = deriveRequiredItems({ items: ['safety-footwear'], otherItems: [], arcCurrentA: null, noise: [] }, site);
    expect(r.required.map((i) => i.code)).toEqual(['safety-footwear']);
    expect(r.shade).toBeNull();
    expect(r.hearing).toBeNull();
  });
});

describe('both noise verdicts, the impact peak and the protector', () => {
  const shift = [
    { levelDbA: 90, hours: 8 },
    { levelDbA: 85, hours: 4 },
  ];
  it('shows the action level and the PEL each on its own basis', () => {
    // OSHA 29 CFR 1910.95 App. A: 80–130 dBA → 125 %, TWA 91.6 (over the action level);
    // 90–140 dBA → 100 %, TWA 90.0 (at the PEL, not over it, 1910.95(b)(1))
    const h = deriveHearing({ noise: shift }, site)!;
    expect(h.actionLevel).toMatchObject({ dosePercent: 125, twaDbA: 91.6, reached: true, limitDbA: 85 });
    expect(h.pel).toMatchObject({ dosePercent: 100, twaDbA: 90, reached: false, limitDbA: 90 });
    expect(h.band).toBe('action-level');
    expect(h.required).toBe(true);
  });
  it('a peak over 140 dB requires protection whatever the dose', () => {
    // OSHA 29 CFR 1910.95(b)(2)
    const h = deriveHearing({ noise: [{ levelDbA: 80, hours: 2 }], peakDbC: 142 }, site)!;
    expect(h.peak).toMatchObject({ exceeded: true, limitDb: 140 });
    expect(h.required).toBe(true);
    const r = deriveRequiredItems({ items: [], otherItems: [], arcCurrentA: null, noise: [{ levelDbA: 80, hours: 2 }], peakDbC: 142 }, site);
    expect(r.required.find((i) => i.code === 'hearing-protection')?.detail).toMatch(/peak 142 dB is over 140 dB/);
  });
  it('estimates the protected exposure from the NRR on the PEL-basis TWA', () => {
    // OSHA 29 CFR 1910.95 App. B: 95 − (29 − 7) = 73; derated (OSHA Technical Manual, from memory): 95 − 11 = 84
    const h = deriveHearing({ noise: [{ levelDbA: 95, hours: 8 }], protectorNrr: 29 }, site)!;
    expect(h.protected).toMatchObject({ nrr: 29, twaDbA: 73, deratedTwaDbA: 84 });
  });
});
