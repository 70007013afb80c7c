// shared/locale.ts writes its fixed shapes from Intl parts; these must read exactly like luxon's
// toFormat with the same tokens (a general-purpose date library, zone data from the IANA tz
// database through Intl), which the formatter used before and the rest of the code still uses.
import { afterEach, describe, expect, it } from 'vitest';
import { DateTime } from 'luxon';
import { formatDate, formatDateTime, formatDay, formatTime, todayIn } from '../../shared/locale';
import { setClock } from '../../shared/clock';
import { mulberry32 } from '../../seed/prng';

const ZONES = ['America/Chicago', 'Europe/Berlin', 'Australia/Lord_Howe', 'Asia/Kathmandu', 'Pacific/Apia', 'America/St_Johns', 'UTC'];
// Latin and non-Latin digits (ar-EG, Devanagari), month names with and without a trailing dot.
const LOCALES = ['en-US', 'en-GB', 'de-DE', 'fr-FR', 'pl-PL', 'ja-JP', 'ar-EG', 'hi-IN-u-nu-deva'];

afterEach(() => setClock(null));

describe('Intl shop times', () => {
  it('match luxon at random instants 1900-2100 in every zone and locale', () => {
    const r = mulberry32(4406);
    for (const timeZone of ZONES) {
      for (const locale of LOCALES) {
        const shop = { timeZone, locale };
        for (let i = 0; i < 60; i++) {
          const ms = Date.UTC(1900, 0, 1) + Math.floor(r() * 200 * 365.25 * 86_400_000);
          const iso = new Date(ms).toISOString();
          const dt = DateTime.fromMillis(ms).setZone(timeZone).setLocale(locale);
          const at = `${timeZone} ${locale} ${iso}`;
          expect(formatDateTime(iso, shop, { weekday: true, seconds: true }), at).toBe(dt.toFormat('ccc d LLL yyyy, HH:mm:ss'));
          expect(formatDateTime(ms, shop), at).toBe(dt.toFormat('d LLL yyyy, HH:mm'));
          expect(formatDate(new Date(ms), shop), at).toBe(dt.toFormat('d LLL yyyy'));
          expect(formatTime(iso, shop), at).toBe(dt.toFormat('HH:mm'));
          expect(formatDay(ms, shop), at).toBe(dt.toFormat('d LLL'));
          const day = iso.slice(0, 10);
          expect(formatDate(day, shop), at).toBe(DateTime.fromISO(day, { zone: 'UTC' }).setLocale(locale).toFormat('d LLL yyyy'));
          setClock(iso);
          expect(todayIn(timeZone), at).toBe(DateTime.fromMillis(ms, { zone: timeZone }).toISODate());
        }
      }
    }
  });

  it('reads a date-time without an offset on the local clock, as luxon does', () => {
    const utc = { timeZone: 'UTC', locale: 'en-US' };
    expect(formatDateTime('2026-12-05T14:30', utc)).toBe(DateTime.fromISO('2026-12-05T14:30').setZone('UTC').toFormat('d LLL yyyy, HH:mm'));
    expect(formatDateTime('2026-12-05', utc)).toBe(DateTime.fromISO('2026-12-05').setZone('UTC').toFormat('d LLL yyyy, HH:mm'));
  });

  it('says so for an instant, day or zone it cannot read', () => {
    const utc = { timeZone: 'UTC', locale: 'en-US' };
    expect(formatDateTime('not a time', utc)).toBe('Invalid DateTime');
    expect(formatTime(Number.NaN, utc)).toBe('Invalid DateTime');
    expect(formatDate('2026-02-30', utc)).toBe('Invalid DateTime');
    expect(formatDateTime('2026-12-05T12:00:00Z', { timeZone: 'Mars/Olympus', locale: 'en-US' })).toBe('Invalid DateTime');
    expect(todayIn('Mars/Olympus')).toBe('');
  });
});
