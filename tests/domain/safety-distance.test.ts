import { describe, expect, it } from 'vitest';
import { checkLightCurtain, lightCurtainDistance, lightCurtainMinDistanceMm } from '../../shared/domain/safety-distance';

// ISO 13855:2010, general formula S = K·T + C, C = 8(d − 14), d ≤ 40 mm; each value worked by hand below.
describe('lightCurtainMinDistanceMm (ISO 13855:2010, d ≤ 40 mm)', () => {
  it('uses K = 2000 mm/s when S stays within 500 mm', () => {
    // 2000 mm/s × 0.200 s + 8 × (14 − 14) = 400 mm
    expect(lightCurtainMinDistanceMm({ stoppingTimeMs: 200, detectionCapabilityMm: 14 })).toBe(400);
    // 2000 × 0.100 + 8 × (30 − 14) = 200 + 128 = 328 mm
    expect(lightCurtainMinDistanceMm({ stoppingTimeMs: 100, detectionCapabilityMm: 30 })).toBe(328);
    // Exactly 500 mm stays at K = 2000: 2000 × 0.186 + 8 × 16 = 372 + 128 = 500
    expect(lightCurtainDistance({ stoppingTimeMs: 186, detectionCapabilityMm: 30 })).toEqual({ distanceMm: 500, approachSpeedMmS: 2000, intrusionMm: 128 });
  });

  it('never goes below 100 mm', () => {
    // 2000 × 0.020 + 0 = 40 mm → the 100 mm floor
    expect(lightCurtainMinDistanceMm({ stoppingTimeMs: 20, detectionCapabilityMm: 14 })).toBe(100);
  });

  it('recomputes with K = 1600 mm/s above 500 mm, not less than 500 mm', () => {
    // K = 2000: 600 + 128 = 728 > 500 → K = 1600: 1600 × 0.300 + 128 = 480 + 128 = 608 mm
    expect(lightCurtainDistance({ stoppingTimeMs: 300, detectionCapabilityMm: 30 })).toEqual({ distanceMm: 608, approachSpeedMmS: 1600, intrusionMm: 128 });
    // K = 2000: 560 > 500 → K = 1600: 448 → raised to the 500 mm floor
    expect(lightCurtainMinDistanceMm({ stoppingTimeMs: 280, detectionCapabilityMm: 14 })).toBe(500);
    // d = 40: C = 8 × 26 = 208; T = 0.250 s: 500 + 208 = 708 > 500 → 1600 × 0.25 + 208 = 608 mm
    expect(lightCurtainMinDistanceMm({ stoppingTimeMs: 250, detectionCapabilityMm: 40 })).toBe(608);
  });

  it('rounds up to the whole millimetre', () => {
    // 2000 × 0.1234 + 8 × (20 − 14) = 246.8 + 48 = 294.8 → 295 mm
    expect(lightCurtainMinDistanceMm({ stoppingTimeMs: 123.4, detectionCapabilityMm: 20 })).toBe(295);
  });

  it('refuses d > 40 mm and non-positive inputs with a message naming the input', () => {
    expect(() => lightCurtainMinDistanceMm({ stoppingTimeMs: 200, detectionCapabilityMm: 45 })).toThrow(/above 40 mm.*another rule/);
    expect(() => lightCurtainMinDistanceMm({ stoppingTimeMs: 0, detectionCapabilityMm: 14 })).toThrow(/stopping time must be a number above zero/);
    expect(() => lightCurtainMinDistanceMm({ stoppingTimeMs: Number.NaN, detectionCapabilityMm: 14 })).toThrow(/stopping time/);
    expect(() => lightCurtainMinDistanceMm({ stoppingTimeMs: 100, detectionCapabilityMm: -3 })).toThrow(/detection capability/);
  });
});

describe('checkLightCurtain: the mounting distance measured must be at least S', () => {
  it('passes at or above S and fails below it, with the margin', () => {
    // S = 328 mm (see above)
    expect(checkLightCurtain({ stoppingTimeMs: 100, detectionCapabilityMm: 30, measuredDistanceMm: 328 })).toMatchObject({ pass: true, marginMm: 0 });
    expect(checkLightCurtain({ stoppingTimeMs: 100, detectionCapabilityMm: 30, measuredDistanceMm: 300 })).toMatchObject({ pass: false, marginMm: -28 });
    expect(() => checkLightCurtain({ stoppingTimeMs: 100, detectionCapabilityMm: 30, measuredDistanceMm: 0 })).toThrow(/measured mounting distance/);
  });
});
