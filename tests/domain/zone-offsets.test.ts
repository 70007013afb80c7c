// The cached zone must answer exactly what luxon's own IANAZone answers (Intl, from the IANA tz
// database), at random instants and at every minute around offset changes, in zones whose changes
// are one hour, half an hour, or whole-day jumps.
import { describe, expect, it } from 'vitest';
import { DateTime, IANAZone } from 'luxon';
import { cachedZone } from '../../shared/domain/zone-offsets';
import { mulberry32 } from '../../seed/prng';

// Property checks: generous on a busy 2-core machine; each finishes in a few seconds alone.
const PROPERTY_CHECK_TIMEOUT_MS = 60_000;

const ZONES = ['America/Chicago', 'Europe/Berlin', 'Australia/Lord_Howe', 'Asia/Kathmandu', 'Pacific/Apia', 'America/Sao_Paulo', 'Europe/Dublin', 'UTC'];
const MINUTE = 60_000;

describe('cachedZone', () => {
  it(
    'gives the offsets of the tz database at known changes (US Energy Policy Act 2005: second Sunday of March, 02:00 local)',
    () => {
      const chicago = cachedZone('America/Chicago');
      // 8 Mar 2026 02:00 CST = 08:00 UTC: CST (UTC−6) before, CDT (UTC−5) from then on.
      const change = Date.UTC(2026, 2, 8, 8, 0, 0);
      expect(chicago.offset(change - 1)).toBe(-360);
      expect(chicago.offset(change)).toBe(-300);
      // First Sunday of November, 02:00 CDT = 07:00 UTC, back to CST.
      const back = Date.UTC(2026, 10, 1, 7, 0, 0);
      expect(chicago.offset(back - 1)).toBe(-300);
      expect(chicago.offset(back)).toBe(-360);
      // Nepal keeps UTC+05:45 all year (tz database, Asia/Kathmandu since 1986).
      expect(cachedZone('Asia/Kathmandu').offset(change)).toBe(345);
    },
    PROPERTY_CHECK_TIMEOUT_MS,
  );

  it(
    'matches IANAZone at random instants from 1900 to 2100',
    () => {
      const r = mulberry32(4406);
      const from = Date.UTC(1900, 0, 1);
      const to = Date.UTC(2100, 0, 1);
      for (const name of ZONES) {
        const fast = cachedZone(name);
        const slow = IANAZone.create(name);
        for (let i = 0; i < 3000; i++) {
          const ts = Math.floor(from + r() * (to - from));
          expect(fast.offset(ts), `${name} at ${new Date(ts).toISOString()}`).toBe(slow.offset(ts));
        }
      }
    },
    PROPERTY_CHECK_TIMEOUT_MS,
  );

  it(
    'matches IANAZone minute by minute around every change of 2025-2027',
    () => {
      for (const name of ZONES) {
        const fast = cachedZone(name);
        const slow = IANAZone.create(name);
        let checked = 0;
        // Find the changes hour by hour, then compare every minute of the two hours around each.
        for (let ts = Date.UTC(2025, 0, 1); ts < Date.UTC(2028, 0, 1); ts += 60 * MINUTE) {
          if (slow.offset(ts) === slow.offset(ts + 60 * MINUTE)) continue;
          for (let m = -60; m <= 120; m++) {
            const t = ts + m * MINUTE;
            expect(fast.offset(t), `${name} at ${new Date(t).toISOString()}`).toBe(slow.offset(t));
            checked++;
          }
        }
        if (name === 'America/Chicago' || name === 'Australia/Lord_Howe') expect(checked).toBeGreaterThan(500);
      }
    },
    PROPERTY_CHECK_TIMEOUT_MS,
  );

  it(
    'is a drop-in zone for luxon: same local times, names and calendar arithmetic',
    () => {
      const zone = cachedZone('Australia/Lord_Howe');
      const plain = 'Australia/Lord_Howe';
      const r = mulberry32(7);
      for (let i = 0; i < 500; i++) {
        const ts = Date.UTC(2024, 0, 1) + Math.floor(r() * 3 * 365 * 86_400_000);
        const a = DateTime.fromMillis(ts, { zone });
        const b = DateTime.fromMillis(ts, { zone: plain });
        expect(a.toISO()).toBe(b.toISO());
        expect(a.zoneName).toBe(b.zoneName);
        expect(a.plus({ months: 1 }).toMillis()).toBe(b.plus({ months: 1 }).toMillis());
        expect(a.plus({ days: 7 }).toMillis()).toBe(b.plus({ days: 7 }).toMillis());
      }
    },
    PROPERTY_CHECK_TIMEOUT_MS,
  );
});
