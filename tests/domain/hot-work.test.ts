import { DateTime } from 'luxon';
import { describe, expect, it } from 'vitest';
import { FIRE_WATCH_RULES, fireWatchUntil, type FireWatchRuleId } from '../../shared/domain/hot-work';

const MINUTE = 60_000;

describe('fireWatchUntil', () => {
  const ended = new Date('2026-03-04T15:20:00.000Z');

  it('OSHA: at least a half hour after welding or cutting ends', () => {
    // OSHA 29 CFR 1910.252(a)(2)(iii)(B): "at least a half hour after completion
    // of welding or cutting operations"
    const until = fireWatchUntil(ended, 'osha-1910.252');
    expect(until.getTime() - ended.getTime()).toBe(30 * MINUTE);
    expect(until.toISOString()).toBe('2026-03-04T15:50:00.000Z');
  });

  it('NFPA 51B (2019): at least 1 hour after hot work ends', () => {
    // NFPA 51B, 2019 edition, 5.6.1.1 (via published summaries; NFPA text not checked)
    const until = fireWatchUntil(ended, 'nfpa-51b-2019');
    expect(until.getTime() - ended.getTime()).toBe(60 * MINUTE);
    expect(until.toISOString()).toBe('2026-03-04T16:20:00.000Z');
  });

  it('NFPA 51B (2019) is the longer watch', () => {
    // NFPA 51B-2019 raised the 30-minute watch of the 2014 edition to 1 hour
    expect(fireWatchUntil(ended, 'nfpa-51b-2019').getTime()).toBeGreaterThan(fireWatchUntil(ended, 'osha-1910.252').getTime());
  });

  it('adds elapsed time across midnight and a year end, in any offset', () => {
    const lateNight = DateTime.fromISO('2026-12-31T23:45:00', { zone: 'UTC-6' });
    const until = DateTime.fromJSDate(fireWatchUntil(lateNight.toJSDate(), 'osha-1910.252'), {
      zone: 'UTC-6',
    });
    expect(until.toISO()).toBe('2027-01-01T00:15:00.000-06:00');
  });

  it('does not change the Date it was given', () => {
    const input = new Date(ended.getTime());
    fireWatchUntil(input, 'nfpa-51b-2019');
    expect(input.getTime()).toBe(ended.getTime());
  });

  it('rejects invalid Dates and non-Dates', () => {
    expect(() => fireWatchUntil(new Date('not a date'), 'osha-1910.252')).toThrow(/endedAt is an invalid Date/);
    expect(() => fireWatchUntil('2026-03-04T15:20:00Z' as unknown as Date, 'osha-1910.252')).toThrow(/endedAt must be a Date \(got string\)/);
    expect(() => fireWatchUntil(undefined as unknown as Date, 'osha-1910.252')).toThrow(/endedAt must be a Date/);
  });

  it('rejects unknown rules, naming the ones it knows', () => {
    expect(() => fireWatchUntil(ended, 'nfpa-51b-2014' as FireWatchRuleId)).toThrow(
      /unknown fire-watch rule "nfpa-51b-2014"; expected one of osha-1910\.252, nfpa-51b-2019/,
    );
    // inherited property names are not rules
    expect(() => fireWatchUntil(ended, 'toString' as FireWatchRuleId)).toThrow(/unknown fire-watch rule/);
  });
});

describe('FIRE_WATCH_RULES', () => {
  it('each rule carries a source and description for the settings page', () => {
    for (const [id, rule] of Object.entries(FIRE_WATCH_RULES)) {
      expect(rule.id).toBe(id);
      expect(rule.source.length).toBeGreaterThan(0);
      expect(rule.description.length).toBeGreaterThan(0);
    }
    expect(FIRE_WATCH_RULES['osha-1910.252'].source).toBe('OSHA 29 CFR 1910.252(a)(2)(iii)(B)');
    expect(FIRE_WATCH_RULES['nfpa-51b-2019'].source).toMatch(/NFPA 51B, 2019 edition/);
  });

  it('NFPA 51B (2019) lists the follow-up monitoring separately, not in the watch', () => {
    // NFPA 51B, 2019 edition, 5.6.3: monitoring up to 3 h more, decided per job
    // (via published summaries; NFPA text not checked)
    expect(FIRE_WATCH_RULES['nfpa-51b-2019'].followUpMonitoring?.maxMinutes).toBe(180);
    expect(FIRE_WATCH_RULES['osha-1910.252'].followUpMonitoring).toBeNull();
  });

  it('cannot be changed by a caller', () => {
    const rule = FIRE_WATCH_RULES['osha-1910.252'] as { fireWatchMinutes: number };
    expect(() => {
      rule.fireWatchMinutes = 5;
    }).toThrow(TypeError);
  });
});
