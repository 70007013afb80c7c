// The skip-ahead walk (start near `after` instead of at DTSTART) must give exactly what the plain
// walk from DTSTART gives. Generated rules from a seeded PRNG, so a failure reproduces.
import { describe, expect, it } from 'vitest';
import { expandRecurrence, previousOccurrence, validateRecurrence } from '../../shared/domain/recurrence';

// Property checks: generous on a busy 2-core machine; each finishes in a few seconds alone.
const PROPERTY_CHECK_TIMEOUT_MS = 60_000;

function prng(seed: number) {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

const DAY = 86_400_000;
const ZONES = ['America/Chicago', 'Europe/Berlin', 'Australia/Sydney', 'America/Sao_Paulo', 'Pacific/Apia', 'Asia/Kolkata', 'UTC'];
const DAYS = ['MO', 'TU', 'WE', 'TH', 'FR', 'SA', 'SU'];
const pad = (n: number, w = 2) => String(n).padStart(w, '0');

function randomRule(r: () => number): string {
  const pick = <T>(xs: readonly T[]): T => xs[Math.floor(r() * xs.length)];
  const some = <T>(xs: readonly T[], max: number): T[] => {
    const n = 1 + Math.floor(r() * max);
    return [...new Set(Array.from({ length: n }, () => pick(xs)))];
  };
  const freq = pick(['DAILY', 'WEEKLY', 'WEEKLY', 'MONTHLY', 'MONTHLY', 'YEARLY'] as const);
  const parts = [`FREQ=${freq}`];
  if (r() < 0.5) parts.push(`INTERVAL=${1 + Math.floor(r() * 5)}`);
  if (freq === 'WEEKLY' || freq === 'DAILY') {
    if (r() < 0.7) parts.push(`BYDAY=${some(DAYS, 3).join(',')}`);
  } else if (freq === 'MONTHLY') {
    const c = r();
    if (c < 0.3) parts.push(`BYDAY=${pick(['1', '2', '-1', '3'])}${pick(DAYS)}`);
    else if (c < 0.55) parts.push(`BYMONTHDAY=${some([1, 15, 28, 29, 30, 31, -1, -2], 2).join(',')}`);
    else if (c < 0.8) parts.push(`BYDAY=${some(DAYS, 5).join(',')};BYSETPOS=${pick(['1', '-1', '2', '1,-1'])}`);
  } else if (r() < 0.5) {
    parts.push(`BYMONTH=${1 + Math.floor(r() * 12)}`);
  }
  if (r() < 0.3) parts.push(`BYHOUR=${some([0, 1, 2, 3, 6, 9, 23], 2).join(',')}`);
  if (r() < 0.2) parts.push(`BYMINUTE=${some([0, 15, 30, 45], 2).join(',')}`);
  if (r() < 0.3) parts.push(`WKST=${pick(DAYS)}`);
  if (r() < 0.1) parts.push(`COUNT=${1 + Math.floor(r() * 200)}`);
  else if (r() < 0.15) parts.push(`UNTIL=${2025 + Math.floor(r() * 3)}${pad(1 + Math.floor(r() * 12))}01T000000Z`);
  return parts.join(';');
}

function randomIcal(r: () => number): string {
  const zone = ZONES[Math.floor(r() * ZONES.length)];
  const start = new Date(Date.UTC(2020, 0, 1) + Math.floor(r() * 6 * 365) * DAY);
  const hour = Math.floor(r() * 24);
  const minute = [0, 30][Math.floor(r() * 2)];
  const stamp = `${start.getUTCFullYear()}${pad(start.getUTCMonth() + 1)}${pad(start.getUTCDate())}T${pad(hour)}${pad(minute)}00`;
  const dtstart = zone === 'UTC' ? `DTSTART:${stamp}Z` : `DTSTART;TZID=${zone}:${stamp}`;
  return `${dtstart}\nRRULE:${randomRule(r)}`;
}

const iso = (ds: Date[]) => ds.map((d) => d.toISOString());

describe('recurrence skip-ahead', () => {
  it(
    'gives the same instants as the walk from DTSTART on 1,500 generated rules',
    () => {
      const r = prng(20261201);
      let checked = 0;
      let tried = 0;
      while (checked < 1500 && tried < 6000) {
        tried++;
        const ical = randomIcal(r);
        const nonexistent = r() < 0.3 ? ('skip' as const) : ('shift-forward' as const);
        if (!validateRecurrence(ical).ok) continue;
        // Around DST changes too: `after` anywhere from before DTSTART to years later.
        const after = new Date(Date.UTC(2019, 6, 1) + Math.floor(r() * 9 * 365 * DAY) + Math.floor(r() * 48) * 1_800_000);
        const before = r() < 0.3 ? new Date(after.getTime() + Math.floor(r() * 120) * DAY) : undefined;
        const inclusive = r() < 0.3;
        const limit = 1 + Math.floor(r() * 8);
        const opts = { after, before, inclusive, limit, nonexistent };
        const plain = (() => {
          try {
            return iso(expandRecurrence(ical, { ...opts, skipAhead: false }));
          } catch (e) {
            return String(e);
          }
        })();
        const fast = (() => {
          try {
            return iso(expandRecurrence(ical, opts));
          } catch (e) {
            return String(e);
          }
        })();
        expect(fast, `${ical} ${JSON.stringify(opts)}`).toEqual(plain);
        const prevPlain = previousOccurrence(ical, after, { inclusive, nonexistent, skipAhead: false });
        const prevFast = previousOccurrence(ical, after, { inclusive, nonexistent });
        expect(prevFast?.toISOString() ?? null, `${ical} previous ${after.toISOString()}`).toEqual(prevPlain?.toISOString() ?? null);
        checked++;
      }
      expect(checked).toBe(1500);
    },
    PROPERTY_CHECK_TIMEOUT_MS,
  );

  it(
    'answers repeated questions about the same rule (its cached window of instants) like the plain walk',
    () => {
      const r = prng(4242);
      let rules = 0;
      let questions = 0;
      while (rules < 250) {
        const ical = randomIcal(r);
        const nonexistent = r() < 0.3 ? ('skip' as const) : ('shift-forward' as const);
        if (!validateRecurrence(ical).ok) continue;
        rules++;
        // Questions clustered around one time (as for plans sharing a rule), with a few far away;
        // some land exactly on an instant, to test the inclusive and exclusive edges.
        const centre = Date.UTC(2020, 0, 1) + Math.floor(r() * 7 * 365 * DAY);
        let onInstant: Date | null = null;
        for (let q = 0; q < 14; q++) {
          const far = r() < 0.15;
          const at: Date =
            onInstant && r() < 0.3 ? onInstant : new Date(centre + Math.floor((r() - 0.5) * (far ? 6 * 365 : 400) * DAY) + Math.floor(r() * 48) * 1_800_000);
          const inclusive = r() < 0.4;
          const limit = 1 + Math.floor(r() * 4);
          const before = r() < 0.2 ? new Date(at.getTime() + Math.floor(r() * 60) * DAY) : undefined;
          const opts = { after: at, before, inclusive, limit, nonexistent };
          const plain: string[] | string = (() => {
            try {
              return iso(expandRecurrence(ical, { ...opts, skipAhead: false }));
            } catch (e) {
              return String(e);
            }
          })();
          const fast = (() => {
            try {
              return iso(expandRecurrence(ical, opts));
            } catch (e) {
              return String(e);
            }
          })();
          expect(fast, `${ical} ${JSON.stringify(opts)}`).toEqual(plain);
          const prevPlain = previousOccurrence(ical, at, { inclusive, nonexistent, skipAhead: false });
          const prevFast = previousOccurrence(ical, at, { inclusive, nonexistent });
          expect(prevFast?.toISOString() ?? null, `${ical} previous ${at.toISOString()} inclusive=${inclusive}`).toEqual(prevPlain?.toISOString() ?? null);
          if (Array.isArray(plain) && plain.length > 0) onInstant = new Date(plain[0]);
          questions++;
        }
      }
      expect(questions).toBe(250 * 14);
    },
    PROPERTY_CHECK_TIMEOUT_MS,
  );

  it(
    'agrees across DST changes for rules at the changeover hours',
    () => {
      const cases = [
        'DTSTART;TZID=America/Chicago:20200102T020000\nRRULE:FREQ=WEEKLY;BYDAY=SU',
        'DTSTART;TZID=America/Chicago:20200101T013000\nRRULE:FREQ=DAILY',
        'DTSTART;TZID=Europe/Berlin:20200101T023000\nRRULE:FREQ=MONTHLY;BYDAY=-1SU',
        'DTSTART;TZID=Australia/Sydney:20200101T023000\nRRULE:FREQ=MONTHLY;BYDAY=1SU;INTERVAL=3',
      ];
      for (const ical of cases) {
        for (const nonexistent of ['skip', 'shift-forward'] as const) {
          for (let m = 0; m < 60; m++) {
            const after = new Date(Date.UTC(2021, m, 1));
            const opts = { after, limit: 6, nonexistent };
            expect(iso(expandRecurrence(ical, opts)), ical).toEqual(iso(expandRecurrence(ical, { ...opts, skipAhead: false })));
            expect(previousOccurrence(ical, after, { nonexistent })?.toISOString()).toEqual(
              previousOccurrence(ical, after, { nonexistent, skipAhead: false })?.toISOString(),
            );
          }
        }
      }
    },
    PROPERTY_CHECK_TIMEOUT_MS,
  );
});
