import { describe, it, expect } from 'vitest';
import { advanceSince, readingOrderProblem, thinSeries } from '../../shared/domain/meters';

// House rules of Kerfbook (no published source): counts and running time only rise except at a reset.
const at = (d: number) => new Date(Date.UTC(2026, 0, d));
const r = (d: number, value: number, isReset = false) => ({ at: at(d), value, isReset });
const utc = { timeZone: 'UTC', locale: 'en-US' };
const chicago = { timeZone: 'America/Chicago', locale: 'en-US' };

describe('readingOrderProblem', () => {
  it('accepts a rising or equal count and refuses a falling one unless it is a reset', () => {
    expect(readingOrderProblem('count', r(1, 100), r(2, 100), 'starts', utc)).toBeNull();
    expect(readingOrderProblem('count', r(1, 100), r(2, 150), 'starts', utc)).toBeNull();
    expect(readingOrderProblem('count', r(1, 100), r(2, 99), 'starts', utc)).toBe(
      '99 starts is lower than the reading before it (100 starts on 1 Jan 2026, 00:00); record it as a reset if the counter started again from zero',
    );
    expect(readingOrderProblem('count', r(1, 100), r(2, 3, true), 'starts', utc)).toBeNull();
    expect(readingOrderProblem('running-time', null, r(2, 5), 'h', utc)).toBeNull();
  });

  it("names the earlier reading's time on the shop's clock, as the screens show it", () => {
    // 2026-01-01 00:00 UTC is the evening before in America/Chicago (UTC-6 in winter).
    expect(readingOrderProblem('count', r(1, 100), r(2, 99), 'starts', chicago)).toBe(
      '99 starts is lower than the reading before it (100 starts on 31 Dec 2025, 18:00); record it as a reset if the counter started again from zero',
    );
  });

  it('groups thousands in the shop locale so a long counter can be read at a glance', () => {
    // CLDR number symbols: en-US groups with "," and marks decimals with "."; de-DE the other way round.
    expect(readingOrderProblem('count', r(1, 1_234_567), r(2, 98_765.5), 'starts', utc)).toMatch(
      /^98,765\.5 starts is lower than the reading before it \(1,234,567 starts on /,
    );
    expect(readingOrderProblem('count', r(1, 1_234_567), r(2, 98_765.5), 'starts', { timeZone: 'UTC', locale: 'de-DE' })).toMatch(
      /^98\.765,5 starts is lower than the reading before it \(1\.234\.567 starts on 1 Jan 2026, 00:00\)/,
    );
  });

  it('refuses negative counts and hours even as a reset, but lets condition readings fall and go negative', () => {
    expect(readingOrderProblem('running-time', null, r(2, -1, true), 'h', utc)).toBe('A running time cannot be negative (-1 h)');
    expect(readingOrderProblem('condition', r(1, 900), r(2, 600), 'Pa', utc)).toBeNull();
    expect(readingOrderProblem('condition', r(1, 5), r(2, -12), '°C', utc)).toBeNull();
    expect(readingOrderProblem('count', null, r(1, Number.NaN), 'hits', utc)).toBe('The reading is not a number');
  });
});

describe('advanceSince', () => {
  it('sums the rises from the start value', () => {
    expect(advanceSince(1000, [r(2, 1200), r(3, 1500)])).toBe(500);
  });
  it('counts a reset reading from zero: 1000→1400, reset at 50, →300 is 400 + 50 + 250', () => {
    expect(advanceSince(1000, [r(2, 1400), r(3, 50, true), r(4, 300)])).toBe(700);
  });
  it('is zero without readings', () => {
    expect(advanceSince(10, [])).toBe(0);
  });
});

describe('thinSeries', () => {
  it('keeps short series whole and thins long ones to the limit, first and last kept', () => {
    expect(thinSeries([1, 2, 3], 5)).toEqual([1, 2, 3]);
    const long = Array.from({ length: 1001 }, (_, i) => i);
    const thin = thinSeries(long, 11);
    expect(thin).toEqual([0, 100, 200, 300, 400, 500, 600, 700, 800, 900, 1000]);
  });
});
