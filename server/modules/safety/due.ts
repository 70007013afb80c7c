import { DateTime } from 'luxon';
import { evaluatePlan, MIN_GRACE_MS, type Evaluation, type Trigger } from '../../../shared/domain/due';
import { expandRecurrence } from '../../../shared/domain/recurrence';
import type { SafetySettings } from '../../../shared/schemas/safety-records';
import type { CheckCadence } from '../../../shared/schemas/safety-ppe';

const HOUR_MS = 3_600_000;

/**
 * The periodic inspection falls due `months` after the last certified inspection (or after the
 * first approval), counted in the shop's time zone: OSHA 29 CFR 1910.147(c)(6)(i) asks for at
 * least one a year. Due soon 30 days ahead (house rule).
 */
export function inspectionEvaluation(a: { firstApprovedAt: Date; lastInspectedOn: string | null; months: number; timeZone: string; now: Date }): Evaluation {
  const lastDoneAt = a.lastInspectedOn ? DateTime.fromISO(a.lastInspectedOn, { zone: a.timeZone }).startOf('day').toJSDate() : null;
  const ev = evaluatePlan({
    now: a.now,
    startedAt: a.firstApprovedAt,
    lastDoneAt,
    lastRaisedKey: null,
    triggers: [{ kind: 'calendar-floating', every: a.months, unit: 'month', tz: a.timeZone }],
    meters: {},
    dueSoon: { days: 30 },
  });
  // The regulation sets a deadline, not a grace period: past the due day it is overdue.
  if (ev.status === 'due' && ev.dueAt && a.now.getTime() - ev.dueAt.getTime() > MIN_GRACE_MS) return { ...ev, status: 'overdue' };
  return ev;
}

/** RFC 5545 text for one shift start on the site's work days (weekly cadence: first shift of the first work day). */
export function ppeRules(cadence: CheckCadence, settings: Pick<SafetySettings, 'shiftStarts' | 'workDays'>, timeZone: string, since: Date): string[] {
  if (cadence === 'none') return [];
  const day = DateTime.fromJSDate(since, { zone: timeZone }).startOf('day').toFormat('yyyyLLdd');
  const rule = (hhmm: string, byday: string) => `DTSTART;TZID=${timeZone}:${day}T${hhmm.replace(':', '')}00\nRRULE:FREQ=WEEKLY;BYDAY=${byday}`;
  if (cadence === 'week') return [rule([...settings.shiftStarts].sort()[0], settings.workDays[0])];
  return settings.shiftStarts.map((s) => rule(s, settings.workDays.join(',')));
}

/** A check up to an hour before a shift start counts for that shift (house rule, as the due-soon window). */
export const PPE_LEAD_MS = HOUR_MS;

export function ppeEvaluation(a: {
  cadence: CheckCadence;
  settings: SafetySettings;
  timeZone: string;
  startedAt: Date;
  lastCheckAt: Date | null;
  now: Date;
}): Evaluation | null {
  const rules = ppeRules(a.cadence, a.settings, a.timeZone, a.startedAt);
  if (rules.length === 0) return null;
  const triggers: Trigger[] = rules.map((ical) => ({ kind: 'calendar-fixed', ical }));
  return evaluatePlan({
    now: a.now,
    startedAt: a.startedAt,
    lastDoneAt: a.lastCheckAt,
    lastRaisedKey: null,
    triggers,
    meters: {},
    dueSoon: { days: PPE_LEAD_MS / 86_400_000 },
  });
}

/**
 * Expected PPE checks in [from, to): an occurrence is done when a check falls between an hour
 * before it and an hour before the next occurrence; missed once that window has closed by `to`;
 * pending while it is still open.
 */
export function ppeOccurrences(a: {
  cadence: CheckCadence;
  settings: SafetySettings;
  timeZone: string;
  startedAt: Date;
  from: Date;
  to: Date;
  checks: Date[];
}) {
  const start = new Date(Math.max(a.from.getTime(), a.startedAt.getTime()));
  if (start >= a.to) return [];
  const horizon = new Date(a.to.getTime() + 8 * 24 * HOUR_MS);
  const occ = ppeRules(a.cadence, a.settings, a.timeZone, a.startedAt)
    .flatMap((ical) => expandRecurrence(ical, { after: start, before: horizon, inclusive: true, limit: 5000 }))
    .sort((x, y) => x.getTime() - y.getTime());
  const checks = a.checks.map((c) => c.getTime());
  const out: { at: Date; status: 'done' | 'missed' | 'pending' }[] = [];
  for (let i = 0; i < occ.length && occ[i] < a.to; i++) {
    const lo = occ[i].getTime() - PPE_LEAD_MS;
    const hi = i + 1 < occ.length ? occ[i + 1].getTime() - PPE_LEAD_MS : occ[i].getTime() + 7 * 24 * HOUR_MS;
    const done = checks.some((c) => c >= lo && c < hi);
    out.push({ at: occ[i], status: done ? 'done' : hi > a.to.getTime() ? 'pending' : 'missed' });
  }
  return out;
}
