import { describe, it, expect } from 'vitest';
import {
  evaluatePreUse,
  FILTER_PRESSURE_DROP_MAX_PA,
  missedPreUseCheck,
  PRE_USE_LINES,
  PreUseAnswerError,
  preUseLinesFor,
  shopDayStart,
} from '../../shared/domain/pre-use-checks';

const brake = preUseLinesFor('press-brake')!;
const extractor = preUseLinesFor('fume-extractor')!;

describe('pre-use check lines', () => {
  it('mark guards, light curtain, foot pedal, collision sensor and spark arrestor safety-critical', () => {
    // common practice: a failed guard or protective device leaves a person unprotected
    const critical = Object.values(PRE_USE_LINES)
      .flat()
      .filter((l) => l!.safetyCritical)
      .map((l) => l!.code);
    expect(new Set(critical)).toEqual(new Set(['light-curtain', 'foot-pedal', 'guards', 'collision-sensor', 'spark-arrestor']));
    expect(preUseLinesFor('hydraulic-unit')).toBeNull();
    expect(preUseLinesFor('torch')).toBeNull();
  });

  it('a machine meter’s limits replace the default reading limit', () => {
    expect(extractor.find((l) => l.code === 'pressure-drop')!.reading).toMatchObject({ max: FILTER_PRESSURE_DROP_MAX_PA, unit: 'Pa' });
    const own = preUseLinesFor('fume-extractor', { 'pressure-drop': { min: 200, max: 2000, source: 'meter' } })!;
    expect(own.find((l) => l.code === 'pressure-drop')!.reading).toMatchObject({ min: 200, max: 2000, unit: 'Pa' });
  });
});

describe('evaluatePreUse', () => {
  const all = (ok: boolean) => brake.map((l) => ({ code: l.code, ok }));

  it('passes when every line is OK', () => {
    const r = evaluatePreUse(brake, all(true));
    expect(r).toMatchObject({ pass: true, safetyCriticalFailed: false, failed: [] });
  });

  it('names the failed lines and whether a safety-critical one failed', () => {
    const clampsOnly = evaluatePreUse(brake, [
      { code: 'light-curtain', ok: true },
      { code: 'foot-pedal', ok: true },
      { code: 'die-clamps', ok: false },
    ]);
    expect(clampsOnly.failed.map((f) => f.code)).toEqual(['die-clamps']);
    expect(clampsOnly.safetyCriticalFailed).toBe(false);
    const pedal = evaluatePreUse(brake, [
      { code: 'foot-pedal', ok: false },
      { code: 'light-curtain', ok: true },
      { code: 'die-clamps', ok: true },
    ]);
    expect(pedal.failed.map((f) => f.code)).toEqual(['foot-pedal']);
    expect(pedal.safetyCriticalFailed).toBe(true);
  });

  it('fails a reading outside its limits even when tapped OK, and passes one at the limit', () => {
    // 1500 Pa cartridge change point (from memory)
    const at = evaluatePreUse(extractor, [
      { code: 'spark-arrestor', ok: true },
      { code: 'pressure-drop', ok: true, value: 1500 },
    ]);
    expect(at.pass).toBe(true);
    const over = evaluatePreUse(extractor, [
      { code: 'spark-arrestor', ok: true },
      { code: 'pressure-drop', ok: true, value: 1501 },
    ]);
    expect(over.failed[0]).toMatchObject({ code: 'pressure-drop', problem: '1501 Pa is above the 1500 Pa limit', safetyCritical: false });
    const low = evaluatePreUse(preUseLinesFor('fume-extractor', { 'pressure-drop': { min: 200, max: null, source: 'meter' } })!, [
      { code: 'spark-arrestor', ok: true },
      { code: 'pressure-drop', ok: true, value: 150 },
    ]);
    expect(low.failed[0].problem).toBe('150 Pa is below the 200 Pa limit');
  });

  it('refuses a missing line, a doubled or unknown answer and a missing reading, naming the field', () => {
    const field = (f: () => unknown) => {
      try {
        f();
      } catch (e) {
        return (e as PreUseAnswerError).field;
      }
      return null;
    };
    expect(field(() => evaluatePreUse(brake, all(true).slice(1)))).toBe('answers');
    expect(field(() => evaluatePreUse(brake, [...all(true), { code: 'die-clamps', ok: true }]))).toBe('answers.3.code');
    expect(field(() => evaluatePreUse(brake, [...all(true), { code: 'water-level', ok: true }]))).toBe('answers.3.code');
    expect(
      field(() =>
        evaluatePreUse(extractor, [
          { code: 'spark-arrestor', ok: true },
          { code: 'pressure-drop', ok: true },
        ]),
      ),
    ).toBe('answers.1.value');
  });
});

describe('missed check in the shop day', () => {
  // IANA tzdb: America/Chicago is UTC−6 in January (CST) and UTC−5 after the March DST change (CDT).
  it('starts the day at local midnight, across the spring DST change', () => {
    expect(shopDayStart(new Date('2027-01-15T12:00:00Z'), 'America/Chicago').toISOString()).toBe('2027-01-15T06:00:00.000Z');
    // 2027-03-14 is the second Sunday of March: midnight is still CST, the day is 23 h long.
    expect(shopDayStart(new Date('2027-03-14T20:00:00Z'), 'America/Chicago').toISOString()).toBe('2027-03-14T06:00:00.000Z');
    expect(shopDayStart(new Date('2027-03-15T20:00:00Z'), 'America/Chicago').toISOString()).toBe('2027-03-15T05:00:00.000Z');
  });

  it('counts a machine as missed only when it needs a check and none was signed since the day began', () => {
    const now = new Date('2027-01-15T12:00:00Z');
    const tz = 'America/Chicago';
    expect(missedPreUseCheck({ needsCheck: true, lastCheckAt: null, now, timeZone: tz })).toBe(true);
    expect(missedPreUseCheck({ needsCheck: true, lastCheckAt: new Date('2027-01-15T05:59:00Z'), now, timeZone: tz })).toBe(true);
    expect(missedPreUseCheck({ needsCheck: true, lastCheckAt: new Date('2027-01-15T06:00:00Z'), now, timeZone: tz })).toBe(false);
    expect(missedPreUseCheck({ needsCheck: false, lastCheckAt: null, now, timeZone: tz })).toBe(false);
  });
});
