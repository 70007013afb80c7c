import { describe, it, expect } from 'vitest';
import { dateOrder, datePattern, formatTypedDate, parseTypedDate } from '../../shared/domain/typed-date';

describe('dates typed in the shop’s usual format', () => {
  it('reads the field order from the locale', () => {
    // CLDR short date patterns (Unicode TR35): en-US M/d/y, en-GB dd/MM/y, de-DE dd.MM.y.
    expect(dateOrder('en-US')).toEqual(['month', 'day', 'year']);
    expect(dateOrder('en-GB')).toEqual(['day', 'month', 'year']);
    expect(datePattern('en-US')).toBe('MM/DD/YYYY');
    expect(datePattern('de-DE')).toBe('DD.MM.YYYY');
  });

  it('reads 11/01/2026 as 1 November in the US and 11 January in Britain', () => {
    expect(parseTypedDate('11/01/2026', 'en-US')).toBe('2026-11-01');
    expect(parseTypedDate('11/01/2026', 'en-GB')).toBe('2026-01-11');
    expect(parseTypedDate('1/5/2026', 'en-US')).toBe('2026-01-05');
    expect(parseTypedDate('01.11.2026', 'de-DE')).toBe('2026-11-01');
  });

  it('accepts the ISO 8601 calendar date in every locale', () => {
    // ISO 8601-1:2019 §5.2.2.1 calendar date, extended format YYYY-MM-DD.
    expect(parseTypedDate('2026-11-01', 'en-US')).toBe('2026-11-01');
    expect(parseTypedDate('2026-11-01', 'en-GB')).toBe('2026-11-01');
  });

  it('refuses a short year, a day that does not exist and letters, and reads blank as no date', () => {
    expect(parseTypedDate('11/01/26', 'en-US')).toEqual({ error: 'Write the year in full (four digits): MM/DD/YYYY' });
    expect(parseTypedDate('0002-11-01', 'en-US')).toHaveProperty('error');
    // 2026 is not a leap year (Gregorian rule: divisible by 4, not by 100 unless by 400).
    expect(parseTypedDate('02/29/2026', 'en-US')).toHaveProperty('error');
    expect(parseTypedDate('02/29/2028', 'en-US')).toBe('2028-02-29');
    expect(parseTypedDate('13/01/2026', 'en-US')).toHaveProperty('error');
    expect(parseTypedDate('next week', 'en-US')).toHaveProperty('error');
    expect(parseTypedDate('  ', 'en-US')).toBeNull();
  });

  it('writes a stored date back the way it is typed, and that reads back the same', () => {
    for (const locale of ['en-US', 'en-GB', 'de-DE']) {
      const shown = formatTypedDate('2026-03-09', locale);
      expect(parseTypedDate(shown, locale)).toBe('2026-03-09');
    }
    expect(formatTypedDate('2026-03-09', 'en-US')).toBe('03/09/2026');
  });
});
