import { describe, expect, it } from 'vitest';
import { evaluatePlan, type PlanInput, type Trigger } from '../../shared/domain/due';
import { D, plan, WEEKLY_MONDAY } from './due-fixtures';

// `changesAt` is the earliest instant at which an evaluation's status can change with time alone.
// Checks: hand-worked boundaries from the house rules in shared/domain/due/index.ts (window, grace = max(window, 1 day)),
// and an invariant over many generated plans: between `now` and `changesAt` the status stays the same.
// Calendar facts: 2024-03-04 and 2024-03-11 are Mondays; Europe/Berlin is UTC+1 in March before the 31st.

const DAY = 86_400_000;

describe('changesAt, hand-worked', () => {
  it('fixed calendar: not due → coming up at occurrence − window', () => {
    // Next occurrence Mon 11 Mar 07:00 CET = 06:00Z; window 2 d → due-soon from Sat 9 Mar 06:00Z.
    const e = evaluatePlan(plan({}));
    expect(e.status).toBe('not-due');
    expect(e.changesAt?.toISOString()).toBe('2024-03-09T06:00:00.000Z');
    expect(evaluatePlan(plan({ now: e.changesAt! })).status).toBe('due-soon');
  });

  it('fixed calendar: coming up → due at the occurrence; due → overdue just after the grace', () => {
    const soon = evaluatePlan(plan({ now: D('2024-03-10T00:00:00Z') }));
    expect(soon.changesAt?.toISOString()).toBe('2024-03-11T06:00:00.000Z');
    const due = evaluatePlan(plan({ now: D('2024-03-11T06:00:00Z') }));
    expect(due.status).toBe('due');
    // Grace = max(2 d window, 1 d) = 2 d; overdue is "more than" the grace, so 1 ms after.
    expect(due.changesAt?.toISOString()).toBe('2024-03-13T06:00:00.001Z');
    expect(evaluatePlan(plan({ now: D('2024-03-13T06:00:00.000Z') })).status).toBe('due');
    expect(evaluatePlan(plan({ now: due.changesAt! })).status).toBe('overdue');
  });

  it('overdue has no time boundary left', () => {
    expect(evaluatePlan(plan({ now: D('2024-03-20T00:00:00Z') })).changesAt).toBeNull();
  });

  it('meter without readings changes only with new readings', () => {
    const e = evaluatePlan(plan({ triggers: [{ kind: 'meter', meterId: 'h', every: 100 }], meters: { h: { baseline: 0, latest: null, recent: [] } } }));
    expect(e.changesAt).toBeNull();
  });

  it('meter: forecast crossing minus the window in days', () => {
    // 10 units/day: 0 on 1 Mar, 50 on 6 Mar; due at 100 → forecast 11 Mar 00:00Z; 2-day window → 9 Mar 00:00Z.
    const readings = [
      { at: D('2024-03-01T00:00:00Z'), value: 0 },
      { at: D('2024-03-06T00:00:00Z'), value: 50 },
    ];
    const e = evaluatePlan(
      plan({
        now: D('2024-03-07T00:00:00Z'),
        triggers: [{ kind: 'meter', meterId: 'h', every: 100 }],
        meters: { h: { baseline: 0, latest: readings[1], recent: readings } },
      }),
    );
    expect(e.status).toBe('not-due');
    expect(e.changesAt?.toISOString()).toBe('2024-03-09T00:00:00.000Z');
  });

  it('whichever first: the earliest boundary of all triggers', () => {
    const floating: Trigger = { kind: 'calendar-floating', every: 1, unit: 'day', tz: 'UTC' };
    // Floating: done 4 Mar 10:00Z + 1 day = 5 Mar 10:00Z, window 2 d → due-soon already; due at 5 Mar 10:00Z.
    const e = evaluatePlan(plan({ now: D('2024-03-04T12:00:00Z'), triggers: [WEEKLY_MONDAY, floating] }));
    expect(e.changesAt?.toISOString()).toBe('2024-03-05T10:00:00.000Z');
  });
});

/** Small deterministic generator (mulberry32) so a failure can be reproduced. */
function rng(seed: number) {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

describe('changesAt invariant over generated plans', () => {
  it('the status does not change before changesAt (600 plans, 6 probes each)', () => {
    const r = rng(20240311);
    const rules = ['FREQ=WEEKLY;BYDAY=MO', 'FREQ=DAILY', 'FREQ=MONTHLY;BYMONTHDAY=1', 'FREQ=WEEKLY;INTERVAL=2;BYDAY=FR'];
    let checked = 0;
    for (let i = 0; i < 600; i++) {
      const now = new Date(D('2024-03-01T00:00:00Z').getTime() + Math.floor(r() * 60 * DAY));
      const lastDoneAt = r() < 0.2 ? null : new Date(now.getTime() - Math.floor(r() * 40 * DAY));
      const rate = 5 + r() * 50;
      const readings = Array.from({ length: 6 }, (_, k) => ({ at: new Date(now.getTime() - (6 - k) * DAY), value: 1000 + rate * k }));
      const kindPick = r();
      const trig: Trigger[] = [];
      if (kindPick < 0.35)
        trig.push({ kind: 'calendar-fixed', ical: `DTSTART;TZID=Europe/Berlin:20240101T070000\nRRULE:${rules[Math.floor(r() * rules.length)]}` });
      if (kindPick > 0.25 && kindPick < 0.6)
        trig.push({
          kind: 'calendar-floating',
          every: 1 + Math.floor(r() * 4),
          unit: (['day', 'week', 'month'] as const)[Math.floor(r() * 3)],
          tz: 'America/Chicago',
        });
      if (kindPick >= 0.5) trig.push({ kind: 'meter', meterId: 'm', every: 50 + Math.floor(r() * 400) });
      if (kindPick >= 0.8) trig.push({ kind: 'condition', meterId: 'c', above: 1150 + r() * 200 });
      const dueSoon = r() < 0.5 ? { days: Math.floor(r() * 5) } : { days: Math.floor(r() * 3), fraction: r() * 0.3 };
      const input: PlanInput = {
        now,
        startedAt: D('2024-01-01T00:00:00Z'),
        lastDoneAt,
        lastRaisedKey: null,
        triggers: trig,
        meters: { m: { baseline: 1000, latest: readings[5], recent: readings }, c: { baseline: 0, latest: readings[5], recent: readings } },
        dueSoon,
      };
      const e = evaluatePlan(input);
      const limit = e.changesAt ? e.changesAt.getTime() : now.getTime() + 90 * DAY;
      for (let k = 1; k <= 6; k++) {
        const t = now.getTime() + ((limit - now.getTime()) * k) / 7;
        if (t >= limit) continue;
        expect(evaluatePlan({ ...input, now: new Date(t) }).status, `plan ${i} probe ${k}`).toBe(e.status);
        checked++;
      }
    }
    expect(checked).toBeGreaterThan(1500);
  }, 60_000);
});
