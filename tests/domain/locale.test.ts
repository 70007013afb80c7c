import { describe, expect, it } from 'vitest';
import { DateTime } from 'luxon';
import { mulberry32 } from '../../seed/prng';
import { formatDate, formatDateTime, formatDay, formatMoney, formatNumber, formatTime, fromShopLocal, isTimeZone, toShopLocal } from '../../shared/locale';

const chicago = { timeZone: 'America/Chicago', locale: 'en-US' };

describe('shop times', () => {
  it('reads an instant on the shop clock, day month year, 24-hour', () => {
    // US DST starts the second Sunday of March at 02:00 local (Energy Policy Act of 2005, §110): 8 Mar 2026.
    expect(formatDateTime('2026-03-08T07:59:00Z', chicago)).toBe('8 Mar 2026, 01:59'); // CST, UTC−6
    expect(formatDateTime('2026-03-08T08:00:00Z', chicago)).toBe('8 Mar 2026, 03:00'); // CDT, UTC−5
    expect(formatDateTime(new Date('2026-12-05T20:30:05Z'), chicago, { weekday: true, seconds: true })).toBe('Sat 5 Dec 2026, 14:30:05');
    expect(formatTime('2026-12-05T20:30:00Z', chicago)).toBe('14:30');
    expect(formatDay(Date.parse('2026-12-05T20:30:00Z'), chicago)).toBe('5 Dec');
  });

  it('reads like luxon (a general-purpose date library, IANA tz data) at random instants 1950–2080, across offset changes', () => {
    // Zones with half-hour, 45-minute and 30-minute-DST offsets, and one that skipped a whole day (Apia, 30 Dec 2011).
    const zones = ['America/Chicago', 'Europe/Berlin', 'Australia/Lord_Howe', 'Asia/Kathmandu', 'Pacific/Apia', 'America/St_Johns', 'UTC'];
    const r = mulberry32(1910);
    for (const timeZone of zones) {
      for (let i = 0; i < 1500; i++) {
        const ms = Date.UTC(1950, 0, 1) + Math.floor(r() * 130 * 365.25 * 86_400_000);
        const shop = { timeZone, locale: 'en-US' };
        const luxon = DateTime.fromMillis(ms, { zone: timeZone, locale: 'en-US' });
        expect(formatDateTime(ms, shop, { weekday: true, seconds: true }), `${timeZone} ${new Date(ms).toISOString()}`).toBe(
          luxon.toFormat('ccc d LLL yyyy, HH:mm:ss'),
        );
      }
    }
  });

  it('reads each minute either side of a change on the clock of that minute', () => {
    // EU summer time starts the last Sunday of March at 01:00 UTC (Directive 2000/84/EC): 29 Mar 2026, 02:00 CET → 03:00 CEST.
    const berlin = { timeZone: 'Europe/Berlin', locale: 'en-US' };
    expect(formatDateTime(Date.UTC(2026, 2, 29, 0, 59, 59), berlin, { seconds: true })).toBe('29 Mar 2026, 01:59:59');
    expect(formatDateTime(Date.UTC(2026, 2, 29, 1, 0, 0), berlin, { seconds: true })).toBe('29 Mar 2026, 03:00:00');
    // Lord Howe moves by half an hour (UTC+10:30 → +11) on the first Sunday of October at 02:00 local (from memory: NSW Standard Time Act 1987).
    const lordHowe = { timeZone: 'Australia/Lord_Howe', locale: 'en-US' };
    expect(formatTime(Date.UTC(2026, 9, 3, 15, 29), lordHowe)).toBe('01:59');
    expect(formatTime(Date.UTC(2026, 9, 3, 15, 30), lordHowe)).toBe('02:30');
    expect(formatDateTime('not a time', berlin)).toBe('Invalid DateTime');
    expect(formatDateTime(0, { timeZone: 'Mars/Olympus', locale: 'en-US' })).toBe('Invalid DateTime');
  });

  it('shows the date the shop had, not the UTC one', () => {
    // 03:00 UTC on 6 Dec is 21:00 on 5 Dec in Chicago (CST, UTC−6).
    expect(formatDate('2026-12-06T03:00:00Z', chicago)).toBe('5 Dec 2026');
    // A plain calendar date is a day already and moves through no zone.
    expect(formatDate('2026-12-06', { timeZone: 'Pacific/Auckland', locale: 'en-US' })).toBe('6 Dec 2026');
    expect(formatDate(null, chicago)).toBe('—');
  });

  it('takes month names from the shop locale but keeps the order', () => {
    // CLDR German stand-alone abbreviated month (luxon LLL): "Dez" for December.
    expect(formatDate('2026-12-05T12:00:00Z', { timeZone: 'Europe/Berlin', locale: 'de-DE' })).toBe('5 Dez 2026');
  });

  it('round-trips a datetime-local value in the shop zone', () => {
    expect(fromShopLocal('2026-03-14T07:30', 'America/Chicago')).toBe('2026-03-14T12:30:00.000Z');
    expect(toShopLocal('2026-03-14T12:30:00.000Z', 'America/Chicago')).toBe('2026-03-14T07:30');
  });

  it('knows real zones from made-up ones', () => {
    expect(isTimeZone('Europe/Berlin')).toBe(true);
    expect(isTimeZone('Mars/Olympus')).toBe(false);
  });
});

describe('shop numbers', () => {
  it('groups and rounds in the shop locale (CLDR number symbols)', () => {
    expect(formatNumber(12345.678, 'en-US')).toBe('12,345.7');
    expect(formatNumber(12345.678, 'de-DE', { max: 2 })).toBe('12.345,68');
    expect(formatNumber(-0.125, 'en-US', { signed: true, min: 2, max: 3 })).toBe('-0.125');
    expect(formatNumber(2, 'en-US', { signed: true, max: 2 })).toBe('+2');
  });

  it('writes money with the currency when known, else a bare two-decimal amount', () => {
    expect(formatMoney(1234.5, 'en-US', 'USD')).toBe('$1,234.50');
    expect(formatMoney(1234.5, 'en-US', null)).toBe('1,234.50');
    expect(formatMoney(1234.5, 'en-US', 'NOT-A-CODE')).toBe('1,234.50');
  });
});
