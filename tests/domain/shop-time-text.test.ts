// The engine's hand-written local-time text must read exactly like luxon's toFormat('d LLL yyyy HH:mm')
// (a general-purpose date library, zone data from the IANA tz database through Intl).
import { describe, expect, it } from 'vitest';
import { DateTime } from 'luxon';
import { humanReason, shopTimeText } from '../../server/modules/plans/plan-reason';
import { mulberry32 } from '../../seed/prng';

const ZONES = ['America/Chicago', 'Europe/Berlin', 'Australia/Lord_Howe', 'Asia/Kathmandu', 'Pacific/Apia', 'America/St_Johns', 'UTC'];

describe('shopTimeText', () => {
  it('matches luxon at random instants 1950-2080, across DST changes', () => {
    const r = mulberry32(1910);
    for (const zone of ZONES) {
      for (let i = 0; i < 2000; i++) {
        const ms = Date.UTC(1950, 0, 1) + Math.floor(r() * 130 * 365.25 * 86_400_000);
        expect(shopTimeText(ms, zone), `${zone} ${new Date(ms).toISOString()}`).toBe(DateTime.fromMillis(ms, { zone }).toFormat('d LLL yyyy HH:mm'));
      }
    }
  });

  it('writes the minutes of the local clock either side of a change (8 Mar 2026 in Chicago: 01:59 CST, then 03:00 CDT)', () => {
    expect(shopTimeText(Date.UTC(2026, 2, 8, 7, 59), 'America/Chicago')).toBe('8 Mar 2026 01:59');
    expect(shopTimeText(Date.UTC(2026, 2, 8, 8, 0), 'America/Chicago')).toBe('8 Mar 2026 03:00');
  });

  it('rewrites ids and instants of a reason for people', () => {
    const meter = '0b9a7c3e-1111-4222-8333-444455556666';
    const text = humanReason(
      `meter ${meter} reads 120, due at 100 (every 100 from 0); calendar occurrence 2026-03-09T12:00:00.000Z is due (work already raised as cal:2026-03-09T12:00:00.000Z)`,
      (id) => (id === meter ? { name: 'Arc starts', unit: 'starts' } : undefined),
      'America/Chicago',
    );
    expect(text).toBe('Arc starts reads 120, due at 100 (every 100 from 0); calendar occurrence 9 Mar 2026 07:00 is due (work already raised)');
  });
});
