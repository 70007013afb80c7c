import { describe, expect, it } from 'vitest';
import { evaluatePlan, type PlanInput, type Trigger } from '../../shared/domain/due';
import { D, plan } from './due-fixtures';

// All expectations below are hand-worked from the scenario data and the house rules documented at
// the top of shared/domain/due/index.ts (due-soon window, grace = max(window, 1 day), one key per plan).
// Calendar facts used: 2024-03-04 and 2024-04-01 are Mondays; Europe/Berlin is CET (UTC+1) until
// 01:00 UTC on 31 March 2024 and CEST (UTC+2) after (Directive 2000/84/EC: last Sunday of March).

describe('calendar-fixed weekly plan (hand-worked)', () => {
  it('not due more than the window before the next occurrence', () => {
    // Done Mon 4 Mar; next occurrence Mon 11 Mar 06:00Z is 2 d 18 h after Fri 8 Mar 12:00Z > 2 d.
    const e = evaluatePlan(plan({}));
    expect(e.status).toBe('not-due');
    expect(e.dueAt?.toISOString()).toBe('2024-03-11T06:00:00.000Z');
    expect(e.occurrenceKey).toBeNull();
  });

  it('due-soon within the 2-day window', () => {
    // Sat 9 Mar 12:00Z is 1 d 18 h before Mon 11 Mar 06:00Z.
    const e = evaluatePlan(plan({ now: D('2024-03-09T12:00:00Z') }));
    expect(e.status).toBe('due-soon');
    expect(e.occurrenceKey).toBeNull();
  });

  it('due at the occurrence, with the occurrence key', () => {
    const e = evaluatePlan(plan({ now: D('2024-03-11T06:00:00Z') }));
    expect(e.status).toBe('due');
    expect(e.dueAt?.toISOString()).toBe('2024-03-11T06:00:00.000Z');
    expect(e.occurrenceKey).toBe('cal:2024-03-11T06:00:00.000Z');
    expect(e.alreadyRaised).toBe(false);
    expect(e.reason).toMatch(/calendar occurrence 2024-03-11T06:00:00.000Z is due/);
  });

  it('still due up to the grace (= 2-day window), overdue after it', () => {
    // Exactly 2 d after the occurrence: not yet past the grace.
    expect(evaluatePlan(plan({ now: D('2024-03-13T06:00:00Z') })).status).toBe('due');
    const e = evaluatePlan(plan({ now: D('2024-03-14T12:00:00Z') }));
    expect(e.status).toBe('overdue');
    expect(e.occurrenceKey).toBe('cal:2024-03-11T06:00:00.000Z');
    expect(e.reason).toMatch(/overdue by 3.3 d/); // 3 d 6 h
  });

  it('with no due-soon window the grace is 1 day', () => {
    const noWindow = { dueSoon: {} };
    expect(evaluatePlan(plan({ ...noWindow, now: D('2024-03-10T06:00:00Z') })).status).toBe('not-due');
    expect(evaluatePlan(plan({ ...noWindow, now: D('2024-03-12T05:00:00Z') })).status).toBe('due'); // 23 h after
    expect(evaluatePlan(plan({ ...noWindow, now: D('2024-03-12T07:00:00Z') })).status).toBe('overdue'); // 25 h after
  });

  it('work completed early inside the window counts for that occurrence', () => {
    // Done Sun 10 Mar 12:00Z, 18 h before Mon 11 Mar 06:00Z (inside the 2-day window): next is 18 Mar.
    const e = evaluatePlan(plan({ lastDoneAt: D('2024-03-10T12:00:00Z'), now: D('2024-03-11T12:00:00Z') }));
    expect(e.status).toBe('not-due');
    expect(e.dueAt?.toISOString()).toBe('2024-03-18T06:00:00.000Z');
  });

  it('after downtime: one current occurrence (the latest missed), overdue since the first missed', () => {
    // Last done 4 Mar; evaluated again on Wed 10 Apr: 11, 18, 25 Mar (06:00Z), 1 and 8 Apr (05:00Z, CEST) were missed.
    const e = evaluatePlan(plan({ now: D('2024-04-10T12:00:00Z') }));
    expect(e.status).toBe('overdue');
    expect(e.dueAt?.toISOString()).toBe('2024-03-11T06:00:00.000Z');
    expect(e.occurrenceKey).toBe('cal:2024-04-08T05:00:00.000Z');
    expect(e.reason).toMatch(/latest missed occurrence 2024-04-08T05:00:00.000Z/);
  });

  it('idempotent: the same input gives the same key and evaluation', () => {
    const input = plan({ now: D('2024-04-10T12:00:00Z') });
    const a = evaluatePlan(input);
    const b = evaluatePlan(plan({ now: D('2024-04-10T12:00:00Z') }));
    expect(b).toEqual(a);
    expect(b.occurrenceKey).toBe(a.occurrenceKey);
  });

  it('a key raised since the last completion stays the current one (no second work order)', () => {
    // 11 Mar was raised before the downtime and never completed: still the one outstanding occurrence.
    const e = evaluatePlan(plan({ now: D('2024-04-10T12:00:00Z'), lastRaisedKey: 'cal:2024-03-11T06:00:00.000Z' }));
    expect(e.occurrenceKey).toBe('cal:2024-03-11T06:00:00.000Z');
    expect(e.alreadyRaised).toBe(true);
  });

  it('a key from before the last completion is not reused', () => {
    // 4 Mar was raised and then done at 10:00Z that day; 11 Mar is a new occurrence.
    const e = evaluatePlan(plan({ now: D('2024-03-11T07:00:00Z'), lastRaisedKey: 'cal:2024-03-04T06:00:00.000Z' }));
    expect(e.occurrenceKey).toBe('cal:2024-03-11T06:00:00.000Z');
    expect(e.alreadyRaised).toBe(false);
  });

  it('occurrences before the plan start do not count; before first completion the start is the reference', () => {
    // Plan started Wed 6 Mar, never done: the Monday 4 Mar occurrence is ignored; first due is 11 Mar.
    const e = evaluatePlan(plan({ startedAt: D('2024-03-06T00:00:00Z'), lastDoneAt: null, now: D('2024-03-08T00:00:00Z') }));
    expect(e.status).toBe('not-due');
    expect(e.dueAt?.toISOString()).toBe('2024-03-11T06:00:00.000Z');
  });
});

describe('calendar-floating (hand-worked)', () => {
  const monthly: Trigger = { kind: 'calendar-floating', every: 1, unit: 'month', tz: 'Europe/Berlin' };
  // Done 31 Jan 10:00 CET (09:00Z); one month later in Europe/Berlin is 29 Feb 2024 10:00 CET = 09:00Z
  // (the month has no 31st; 2024 is a leap year). Interval 29 d, fraction 0.1 → window 2.9 d.
  const base = plan({ triggers: [monthly], lastDoneAt: D('2024-01-31T09:00:00Z'), startedAt: D('2024-01-01T00:00:00Z'), dueSoon: { fraction: 0.1 } });

  it('not due / due-soon / due / overdue around 29 Feb 09:00Z', () => {
    expect(evaluatePlan({ ...base, now: D('2024-02-25T00:00:00Z') })).toMatchObject({ status: 'not-due', occurrenceKey: null });
    expect(evaluatePlan({ ...base, now: D('2024-02-27T00:00:00Z') }).status).toBe('due-soon'); // 2.375 d before
    const due = evaluatePlan({ ...base, now: D('2024-03-01T00:00:00Z') }); // 0.625 d after
    expect(due.status).toBe('due');
    expect(due.dueAt?.toISOString()).toBe('2024-02-29T09:00:00.000Z');
    expect(due.occurrenceKey).toBe('float:2024-01-31T09:00:00.000Z');
    expect(evaluatePlan({ ...base, now: D('2024-03-04T00:00:00Z') }).status).toBe('overdue'); // 3.625 d > 2.9 d
  });

  it('before the first completion counts from the plan start', () => {
    const fortnightly: Trigger = { kind: 'calendar-floating', every: 2, unit: 'week', tz: 'UTC' };
    const e = evaluatePlan(plan({ triggers: [fortnightly], lastDoneAt: null, startedAt: D('2024-01-15T08:00:00Z'), now: D('2024-01-29T08:00:00Z') }));
    expect(e.status).toBe('due');
    expect(e.dueAt?.toISOString()).toBe('2024-01-29T08:00:00.000Z');
    expect(e.occurrenceKey).toBe('float:2024-01-15T08:00:00.000Z');
  });

  it('keeps the local time across a DST change (09:00 CET + 1 week = 09:00 CEST)', () => {
    const weekly: Trigger = { kind: 'calendar-floating', every: 1, unit: 'week', tz: 'Europe/Berlin' };
    const e = evaluatePlan(plan({ triggers: [weekly], lastDoneAt: D('2024-03-28T08:00:00Z'), now: D('2024-03-29T00:00:00Z') }));
    expect(e.dueAt?.toISOString()).toBe('2024-04-04T07:00:00.000Z');
  });
});

describe('meter every 500 h with a baseline (hand-worked)', () => {
  // Last done at 1 200 h → due at 1 700 h. Readings rise 10 h/day: 1 400, 1 500, 1 600 on 1, 11, 21 Mar.
  const trigger: Trigger = { kind: 'meter', meterId: 'pump-hours', every: 500 };
  const readings = [
    { at: D('2024-03-01T00:00:00Z'), value: 1400 },
    { at: D('2024-03-11T00:00:00Z'), value: 1500 },
    { at: D('2024-03-21T00:00:00Z'), value: 1600 },
  ];
  const meterPlan = (over: Partial<PlanInput>, latest = readings[2], recent = readings) =>
    plan({ triggers: [trigger], meters: { 'pump-hours': { baseline: 1200, latest, recent } }, now: D('2024-03-22T00:00:00Z'), ...over });

  it('forecasts the due date from the usage rate: 100 h left at 10 h/day → 31 Mar', () => {
    const e = evaluatePlan(meterPlan({ dueSoon: { days: 7 } }));
    expect(e.status).toBe('not-due'); // 9 days away > 7
    expect(e.dueMeter).toEqual([{ meterId: 'pump-hours', startValue: 1200, dueValue: 1700, current: 1600, forecastAt: D('2024-03-31T00:00:00Z') }]);
    expect(e.dueAt?.toISOString()).toBe('2024-03-31T00:00:00.000Z');
    expect(evaluatePlan(meterPlan({ dueSoon: { days: 10 } })).status).toBe('due-soon'); // 9 days ≤ 10
  });

  it('due-soon within fraction × every of the mark (0.2 × 500 = 100 h)', () => {
    expect(evaluatePlan(meterPlan({ dueSoon: { fraction: 0.2 } })).status).toBe('due-soon');
    expect(evaluatePlan(meterPlan({ dueSoon: { fraction: 0.19 } })).status).toBe('not-due');
  });

  it('due once the meter passes the mark; crossing time interpolated; overdue past fraction × every', () => {
    // 1 690 on 31 Mar 00:00Z, 1 710 on 1 Apr 00:00Z → 1 700 reached half-way, 31 Mar 12:00Z.
    const later = [...readings, { at: D('2024-03-31T00:00:00Z'), value: 1690 }, { at: D('2024-04-01T00:00:00Z'), value: 1710 }];
    const e = evaluatePlan(meterPlan({ now: D('2024-04-01T06:00:00Z'), dueSoon: { fraction: 0.1 } }, later[4], later));
    expect(e.status).toBe('due'); // 10 h over ≤ 50 h grace
    expect(e.occurrenceKey).toBe('meter:pump-hours:1700');
    expect(e.dueMeter[0].forecastAt?.toISOString()).toBe('2024-03-31T12:00:00.000Z');
    const past = [...later, { at: D('2024-04-06T00:00:00Z'), value: 1760 }];
    const o = evaluatePlan(meterPlan({ now: D('2024-04-06T06:00:00Z'), dueSoon: { fraction: 0.1 } }, past[5], past));
    expect(o.status).toBe('overdue'); // 60 h over > 50 h
    expect(o.occurrenceKey).toBe('meter:pump-hours:1700'); // still the same occurrence, not 2200
  });

  it('without a fraction the grace is time since crossing: max(days, 1 day)', () => {
    const later = [...readings, { at: D('2024-03-31T00:00:00Z'), value: 1690 }, { at: D('2024-04-01T00:00:00Z'), value: 1710 }];
    expect(evaluatePlan(meterPlan({ now: D('2024-04-03T12:00:00Z'), dueSoon: { days: 3 } }, later[4], later)).status).toBe('due'); // 3 d
    expect(evaluatePlan(meterPlan({ now: D('2024-04-04T00:00:00Z'), dueSoon: { days: 3 } }, later[4], later)).status).toBe('overdue'); // 3.5 d
  });

  it('no reading yet → not due, with a reason', () => {
    const e = evaluatePlan(meterPlan({}, null as never, []));
    expect(e.status).toBe('not-due');
    expect(e.dueMeter[0]).toEqual({ meterId: 'pump-hours', startValue: 1200, dueValue: 1700, current: null, forecastAt: null });
    expect(e.reason).toMatch(/no reading yet/);
  });
});

describe('condition: filter pressure drop above a limit (hand-worked)', () => {
  const trigger: Trigger = { kind: 'condition', meterId: 'filter-dp', above: 1.5 };
  const series = [
    { at: D('2024-03-01T00:00:00Z'), value: 0.8 },
    { at: D('2024-03-05T00:00:00Z'), value: 1.2 },
    { at: D('2024-03-08T00:00:00Z'), value: 1.6 },
    { at: D('2024-03-09T00:00:00Z'), value: 1.7 },
  ];
  const condPlan = (over: Partial<PlanInput>, recent = series) =>
    plan({
      triggers: [trigger],
      meters: { 'filter-dp': { baseline: 0, latest: recent[recent.length - 1] ?? null, recent } },
      lastDoneAt: D('2024-02-20T00:00:00Z'),
      now: D('2024-03-09T12:00:00Z'),
      dueSoon: { days: 2 },
      ...over,
    });

  it('due when the latest reading is above the limit; key = first reading of the run above it', () => {
    const e = evaluatePlan(condPlan({}));
    expect(e.status).toBe('due'); // above since 8 Mar 00:00Z, 1.5 d ≤ 2 d
    expect(e.occurrenceKey).toBe('cond:filter-dp:2024-03-08T00:00:00.000Z');
    expect(e.dueAt?.toISOString()).toBe('2024-03-08T00:00:00.000Z');
    // A further reading above the limit does not make a new occurrence.
    const more = [...series, { at: D('2024-03-09T06:00:00Z'), value: 1.8 }];
    expect(evaluatePlan(condPlan({}, more)).occurrenceKey).toBe('cond:filter-dp:2024-03-08T00:00:00.000Z');
  });

  it('overdue when above the limit for longer than the grace', () => {
    expect(evaluatePlan(condPlan({ now: D('2024-03-11T00:00:00Z') })).status).toBe('overdue'); // 3 d > 2 d
  });

  it('exactly on the limit is not above it', () => {
    const onLimit = [...series.slice(0, 2), { at: D('2024-03-08T00:00:00Z'), value: 1.5 }];
    expect(evaluatePlan(condPlan({ dueSoon: {} }, onLimit)).status).toBe('not-due');
  });

  it('readings before the last completion are ignored (new filter fitted)', () => {
    const e = evaluatePlan(condPlan({ lastDoneAt: D('2024-03-08T12:00:00Z') }));
    expect(e.occurrenceKey).toBe('cond:filter-dp:2024-03-09T00:00:00.000Z');
    const none = evaluatePlan(condPlan({ lastDoneAt: D('2024-03-09T06:00:00Z') }));
    expect(none.status).toBe('not-due');
    expect(none.reason).toMatch(/no reading since last done/);
  });

  it('due-soon near the limit (fraction of the limit) or when the trend reaches it within days', () => {
    // 1.4 ≥ 1.5 − 0.1 × 1.5 = 1.35.
    const near = [...series.slice(0, 2), { at: D('2024-03-08T00:00:00Z'), value: 1.4 }];
    expect(evaluatePlan(condPlan({ dueSoon: { fraction: 0.1 } }, near)).status).toBe('due-soon');
    // Rising 0.1 per day: 0.9, 1.0, 1.1 on 1-3 Mar → reaches 1.5 four days after 3 Mar, i.e. 7 Mar.
    const rising = [
      { at: D('2024-03-01T00:00:00Z'), value: 0.9 },
      { at: D('2024-03-02T00:00:00Z'), value: 1.0 },
      { at: D('2024-03-03T00:00:00Z'), value: 1.1 },
    ];
    const e = evaluatePlan(condPlan({ now: D('2024-03-03T00:00:00Z'), dueSoon: { days: 5 } }, rising));
    expect(e.status).toBe('due-soon');
    expect(Math.abs((e.dueAt as Date).getTime() - D('2024-03-07T00:00:00Z').getTime())).toBeLessThan(1000);
    expect(evaluatePlan(condPlan({ now: D('2024-03-03T00:00:00Z'), dueSoon: { days: 3 } }, rising)).status).toBe('not-due');
  });

  it('a lower limit works the same way (below)', () => {
    const low: Trigger = { kind: 'condition', meterId: 'filter-dp', below: 0.9 };
    const e = evaluatePlan(condPlan({ triggers: [low] }, [{ at: D('2024-03-09T00:00:00Z'), value: 0.5 }]));
    expect(e.status).toBe('due');
    expect(e.occurrenceKey).toBe('cond:filter-dp:2024-03-09T00:00:00.000Z');
  });
});

describe('two triggers: whichever comes first (hand-worked)', () => {
  const meter: Trigger = { kind: 'meter', meterId: 'pump-hours', every: 500 };
  const sixMonths: Trigger = { kind: 'calendar-floating', every: 6, unit: 'month', tz: 'UTC' };
  const meters = (value: number) => ({
    'pump-hours': { baseline: 1200, latest: { at: D('2024-03-20T00:00:00Z'), value }, recent: [] },
  });
  // Done 1 Jan 2024 → calendar due 1 Jul 2024 00:00Z.
  const both = (value: number, now: string, lastRaisedKey: string | null = null) =>
    evaluatePlan(
      plan({
        triggers: [meter, sixMonths],
        meters: meters(value),
        lastDoneAt: D('2024-01-01T00:00:00Z'),
        startedAt: D('2023-01-01T00:00:00Z'),
        now: D(now),
        lastRaisedKey,
        dueSoon: { days: 7 },
      }),
    );

  it('the meter comes first: due by meter while the calendar is months away', () => {
    const e = both(1710, '2024-03-20T12:00:00Z');
    expect(e.status).toBe('due');
    expect(e.decidedBy).toBe(0);
    expect(e.occurrenceKey).toBe('meter:pump-hours:1700');
    expect(e.triggers.map((t) => t.status)).toEqual(['due', 'not-due']);
  });

  it('the calendar comes first: overdue by date while the meter is short of its mark', () => {
    const e = both(1500, '2024-07-20T00:00:00Z');
    expect(e.status).toBe('overdue');
    expect(e.decidedBy).toBe(1);
    expect(e.occurrenceKey).toBe('float:2024-01-01T00:00:00.000Z');
    expect(e.dueAt?.toISOString()).toBe('2024-07-01T00:00:00.000Z');
  });

  it('once raised by the meter, the calendar deciding later keeps the same key', () => {
    // Meter crossed 1 700 half-way between 1 690 (15 Jul) and 1 710 (18 Jul): 16 Jul 12:00Z, 3.5 d before
    // 20 Jul → 'due' (grace 7 d). The calendar (due 1 Jul, 19 d ago) is 'overdue' and decides, but the
    // work raised for the meter since the last completion is still the open occurrence.
    const e = evaluatePlan(
      plan({
        triggers: [meter, sixMonths],
        meters: {
          'pump-hours': {
            baseline: 1200,
            latest: { at: D('2024-07-18T00:00:00Z'), value: 1710 },
            recent: [{ at: D('2024-07-15T00:00:00Z'), value: 1690 }],
          },
        },
        lastDoneAt: D('2024-01-01T00:00:00Z'),
        startedAt: D('2023-01-01T00:00:00Z'),
        now: D('2024-07-20T00:00:00Z'),
        lastRaisedKey: 'meter:pump-hours:1700',
        dueSoon: { days: 7 },
      }),
    );
    expect(e.triggers.map((t) => t.status)).toEqual(['due', 'overdue']);
    expect(e.decidedBy).toBe(1);
    expect(e.status).toBe('overdue');
    expect(e.occurrenceKey).toBe('meter:pump-hours:1700');
    expect(e.alreadyRaised).toBe(true);
    expect(e.reason).toMatch(/already raised as meter:pump-hours:1700/);
  });

  it('after completion the old meter key is no longer current', () => {
    // Done on 21 Mar at 1 710 h (new baseline 1 710): meter:pump-hours:1700 belongs to the last cycle.
    const e = evaluatePlan(
      plan({
        triggers: [meter, sixMonths],
        meters: { 'pump-hours': { baseline: 1710, latest: { at: D('2024-09-25T00:00:00Z'), value: 1900 }, recent: [] } },
        lastDoneAt: D('2024-03-21T00:00:00Z'),
        now: D('2024-09-25T00:00:00Z'),
        lastRaisedKey: 'meter:pump-hours:1700',
        dueSoon: { days: 7 },
      }),
    );
    // Calendar: 21 Mar + 6 months = 21 Sep, 4 d ago → due; meter 1 900 < 2 210 → not due.
    expect(e.status).toBe('due');
    expect(e.occurrenceKey).toBe('float:2024-03-21T00:00:00.000Z');
    expect(e.alreadyRaised).toBe(false);
  });
});

describe('bad input is rejected with a clear message', () => {
  it('names the problem', () => {
    expect(() => evaluatePlan(plan({ triggers: [] }))).toThrow(/at least one trigger/);
    expect(() => evaluatePlan(plan({ now: D('not a date') }))).toThrow(/now must be a valid Date/);
    expect(() => evaluatePlan(plan({ dueSoon: { fraction: 1.5 } }))).toThrow(/dueSoon.fraction must be/);
    expect(() => evaluatePlan(plan({ dueSoon: { days: -1 } }))).toThrow(/dueSoon.days must be/);
    expect(() => evaluatePlan(plan({ triggers: [{ kind: 'meter', meterId: 'nope', every: 500 }] }))).toThrow(/meter "nope", which is not in meters/);
    expect(() =>
      evaluatePlan(plan({ triggers: [{ kind: 'meter', meterId: 'h', every: 0 }], meters: { h: { baseline: 0, latest: null, recent: [] } } })),
    ).toThrow(/every must be a positive number/);
    expect(() => evaluatePlan(plan({ triggers: [{ kind: 'condition', meterId: 'h' }], meters: { h: { baseline: 0, latest: null, recent: [] } } }))).toThrow(
      /needs above or below/,
    );
    expect(() => evaluatePlan(plan({ triggers: [{ kind: 'calendar-floating', every: 1, unit: 'month', tz: 'Nowhere/Town' }] }))).toThrow(
      /tz "Nowhere\/Town" is not a known IANA time zone/,
    );
    expect(() => evaluatePlan(plan({ triggers: [{ kind: 'calendar-floating', every: 1, unit: 'year' as 'month', tz: 'UTC' }] }))).toThrow(
      /unit must be day, week or month/,
    );
    expect(() => evaluatePlan(plan({ triggers: [{ kind: 'calendar-fixed', ical: 'RRULE:FREQ=WEEKLY' }] }))).toThrow(/missing DTSTART/);
    expect(() => evaluatePlan(plan({ triggers: [{ kind: 'cron' } as unknown as Trigger] }))).toThrow(/unknown kind "cron"/);
  });
});
