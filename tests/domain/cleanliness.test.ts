import { describe, expect, it } from 'vitest';
import { ISO4406_OVER_RANGE, ISO4406_TABLE, compareToTarget, iso4406Code, iso4406ScaleNumber, parseIso4406Code } from '../../shared/domain/cleanliness';

// ISO 4406:1999 Table 1 (unchanged in ISO 4406:2021), transcribed here independently of the module:
// [scale number, more than, up to and including] particles per mL.
const TABLE_1: [number, number, number][] = [
  [28, 1_300_000, 2_500_000],
  [27, 640_000, 1_300_000],
  [26, 320_000, 640_000],
  [25, 160_000, 320_000],
  [24, 80_000, 160_000],
  [23, 40_000, 80_000],
  [22, 20_000, 40_000],
  [21, 10_000, 20_000],
  [20, 5_000, 10_000],
  [19, 2_500, 5_000],
  [18, 1_300, 2_500],
  [17, 640, 1_300],
  [16, 320, 640],
  [15, 160, 320],
  [14, 80, 160],
  [13, 40, 80],
  [12, 20, 40],
  [11, 10, 20],
  [10, 5, 10],
  [9, 2.5, 5],
  [8, 1.3, 2.5],
  [7, 0.64, 1.3],
  [6, 0.32, 0.64],
  [5, 0.16, 0.32],
  [4, 0.08, 0.16],
  [3, 0.04, 0.08],
  [2, 0.02, 0.04],
  [1, 0.01, 0.02],
  [0, 0, 0.01],
];

describe('iso4406ScaleNumber — ISO 4406 Table 1', () => {
  it('the module table matches the published Table 1 row for row', () => {
    // ISO 4406:1999/2021 Table 1, "Allocation of scale numbers".
    const sorted = [...TABLE_1].sort((a, b) => a[0] - b[0]);
    expect(ISO4406_TABLE.map((r) => [r.scale, r.moreThan, r.upTo])).toEqual(sorted);
  });

  it('a count exactly on an upper limit falls in the lower number; just above it, the next', () => {
    // ISO 4406 Table 1 columns: "more than" / "up to and including".
    for (const [scale, moreThan, upTo] of TABLE_1) {
      expect(iso4406ScaleNumber(upTo), `upper limit ${upTo}`).toBe(scale);
      if (moreThan > 0) expect(iso4406ScaleNumber(moreThan), `lower limit ${moreThan}`).toBe(scale - 1);
      expect(iso4406ScaleNumber(upTo * 1.0001), `just above ${upTo}`).toBe(scale === 28 ? ISO4406_OVER_RANGE : scale + 1);
    }
  });

  it('uses the rounded published limits, not powers of two', () => {
    // Table 1: scale 17 is >640 up to 1 300 and scale 18 is >1 300 up to 2 500. A pure doubling
    // (640 × 2 = 1 280) would put 1 290 in scale 18.
    expect(iso4406ScaleNumber(1_290)).toBe(17);
    expect(iso4406ScaleNumber(1_300)).toBe(17);
    expect(iso4406ScaleNumber(1_301)).toBe(18);
    // Scale 13 covers >40 to 80 (the brief example "scale 13: >40–80").
    expect(iso4406ScaleNumber(40.5)).toBe(13);
    expect(iso4406ScaleNumber(80)).toBe(13);
  });

  it('each upper limit is about double the one before (ISO 4406:2021 §4.1: one code ≈ a doubling)', () => {
    // The published limits are rounded, so the step ratio sits between 1.9 and 2.1, never exactly 2 everywhere.
    const ups = [...TABLE_1].sort((a, b) => a[0] - b[0]).map((r) => r[2]);
    for (let i = 1; i < ups.length; i++) {
      const ratio = ups[i] / ups[i - 1];
      expect(ratio).toBeGreaterThan(1.9);
      expect(ratio).toBeLessThan(2.1);
    }
  });

  it('above 2 500 000 per mL is reported as ">28"; zero is scale 0', () => {
    // ISO 4406 Table 1 ends at scale 28 (>1 300 000 up to 2 500 000); higher counts are ">28".
    expect(iso4406ScaleNumber(2_500_001)).toBe(ISO4406_OVER_RANGE);
    expect(iso4406Code({ ge4um: 3_000_000, ge6um: 900_000, ge14um: 5_000 })).toBe('>28/27/19');
    expect(iso4406ScaleNumber(0)).toBe(0);
  });

  it('rejects negative and non-finite counts', () => {
    expect(() => iso4406ScaleNumber(-1)).toThrow(/cannot be negative/);
    expect(() => iso4406ScaleNumber(Number.NaN)).toThrow(/finite number/);
    expect(() => iso4406ScaleNumber(Number.POSITIVE_INFINITY)).toThrow(/finite number/);
  });
});

describe('iso4406Code', () => {
  it('worked example: 300 000 / 50 000 / 700 particles per 100 mL → 19/16/10', () => {
    // Worked example in a published ISO 4406 explainer: counts per 100 mL ÷ 100 = per mL:
    // 3 000 (>2 500–5 000 → 19), 500 (>320–640 → 16), 7 (>5–10 → 10).
    expect(iso4406Code({ ge4um: 300_000 / 100, ge6um: 50_000 / 100, ge14um: 700 / 100 })).toBe('19/16/10');
  });

  it('worked example: code 14/12/7 means >80–160, >20–40 and >0.64–1.3 per mL', () => {
    // ISO 4406:1999 reprint, example "14/12/≥7": ">80 and up to and including 160 particles ≥4 µm(c) per ml,
    // >20 up to 40 ≥6 µm(c), >0.64 up to 1.3 ≥14 µm(c)". Picking a count inside each range must give that code.
    expect(iso4406Code({ ge4um: 120, ge6um: 30, ge14um: 1 })).toBe('14/12/7');
    expect(iso4406Code({ ge4um: 160, ge6um: 40, ge14um: 1.3 })).toBe('14/12/7');
    expect(iso4406Code({ ge4um: 80.5, ge6um: 20.5, ge14um: 0.65 })).toBe('14/12/7');
  });

  it('a typical hydraulic target 18/16/13 (hand-worked from Table 1)', () => {
    // 2 000 per mL (>1 300–2 500 → 18), 500 (>320–640 → 16), 60 (>40–80 → 13).
    expect(iso4406Code({ ge4um: 2_000, ge6um: 500, ge14um: 60 })).toBe('18/16/13');
  });

  it('rejects counts that grow with particle size, and bad values', () => {
    // Counts are cumulative (≥ size), so more particles ≥6 µm than ≥4 µm is impossible.
    expect(() => iso4406Code({ ge4um: 100, ge6um: 200, ge14um: 10 })).toThrow(/must not increase with particle size/);
    expect(() => iso4406Code({ ge4um: 100, ge6um: -1, ge14um: 0 })).toThrow(/ge6um must be a non-negative number/);
  });
});

describe('parseIso4406Code', () => {
  it('parses plain, ">28", "-" and "≥" parts', () => {
    expect(parseIso4406Code('18/16/13')).toEqual({
      ge4um: { scale: 18, lowConfidence: false },
      ge6um: { scale: 16, lowConfidence: false },
      ge14um: { scale: 13, lowConfidence: false },
    });
    // ISO 4406:1999 reprint: "≥" marks a size where fewer than 20 particles were counted ("14/12/≥7").
    expect(parseIso4406Code('14/12/≥7').ge14um).toEqual({ scale: 7, lowConfidence: true });
    expect(parseIso4406Code('14/12/>=7').ge14um).toEqual({ scale: 7, lowConfidence: true });
    expect(parseIso4406Code('>28/27/19').ge4um.scale).toBe(ISO4406_OVER_RANGE);
    // A dash for an unreported size (microscope counts have no ≥4 µm part) — from memory of ISO 4406 usage.
    expect(parseIso4406Code('-/16/13').ge4um).toEqual({ scale: null, lowConfidence: false });
    expect(parseIso4406Code(' 18 / 16 / 13 ').ge6um.scale).toBe(16);
  });

  it('round-trips what iso4406Code writes', () => {
    const code = iso4406Code({ ge4um: 2_000, ge6um: 500, ge14um: 60 });
    const p = parseIso4406Code(code);
    expect([p.ge4um.scale, p.ge6um.scale, p.ge14um.scale].join('/')).toBe(code);
  });

  it('rejects malformed codes with a message naming the part', () => {
    expect(() => parseIso4406Code('18/16')).toThrow(/three parts/);
    expect(() => parseIso4406Code('18/16/13/11')).toThrow(/three parts/);
    expect(() => parseIso4406Code('18/x/13')).toThrow(/part 2 "x"/);
    expect(() => parseIso4406Code('29/16/13')).toThrow(/part 1 "29" .* above 28/);
    expect(() => parseIso4406Code('13/16/18')).toThrow(/cumulative counts cannot grow/);
    expect(() => parseIso4406Code('-/-/-')).toThrow(/no scale numbers/);
  });
});

describe('compareToTarget', () => {
  it('flags each size whose scale number is above the target (hand-worked)', () => {
    const r = compareToTarget('19/16/14', '18/16/13');
    expect(r.ge4um).toEqual({ actual: 19, target: 18, exceeds: true, stepsOver: 1 });
    expect(r.ge6um).toEqual({ actual: 16, target: 16, exceeds: false, stepsOver: 0 });
    expect(r.ge14um).toEqual({ actual: 14, target: 13, exceeds: true, stepsOver: 1 });
    expect(r.exceedsAny).toBe(true);
  });

  it('cleaner than target does not exceed; unreported sizes compare as null', () => {
    const r = compareToTarget('-/15/12', '18/16/13');
    expect(r.ge4um.exceeds).toBeNull();
    expect(r.ge6um).toEqual({ actual: 15, target: 16, exceeds: false, stepsOver: -1 });
    expect(r.exceedsAny).toBe(false);
  });

  it('accepts parsed codes and rejects bad strings', () => {
    expect(compareToTarget(parseIso4406Code('>28/20/15'), '22/20/15').ge4um.exceeds).toBe(true);
    expect(() => compareToTarget('18/16', '18/16/13')).toThrow(/three parts/);
  });
});
