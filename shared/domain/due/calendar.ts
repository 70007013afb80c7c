/** Calendar triggers: fixed RRULE occurrences (RFC 5545, via ../recurrence) and floating intervals. */
import '../../luxon-clock';
import { DateTime } from 'luxon';
import { expandRecurrence, previousOccurrence } from '../recurrence';
import { cachedZone } from '../zone-offsets';
import { COVER_SCAN, MIN_GRACE_MS, type DueStatus, type PlanInput, type Trigger, type TriggerEvaluation } from './types';
import { calendarWindowMs, canonicalZone, daysText, iso, justAfter } from './inputs';

export function evalFixed(t: Extract<Trigger, { kind: 'calendar-fixed' }>, input: PlanInput, index: number): TriggerEvaluation {
  const { now, startedAt, lastDoneAt, dueSoon } = input;
  const base = { index, kind: t.kind } as const;
  const done = lastDoneAt;
  // Occurrences at or before the last completion are done; those before the start do not count.
  const after = done !== null && done.getTime() >= startedAt.getTime() ? done : new Date(startedAt.getTime() - 1);
  // Nearly always the first or second occurrence decides; the long scan is only for work done well ahead.
  let next = expandRecurrence(t.ical, { after, limit: 2 });
  if (next.length === 0) {
    return { ...base, status: 'not-due', dueAt: null, key: null, reason: `calendar: no occurrence after ${iso(after)}`, changesAt: null };
  }
  // The interval only matters for a window that is a share of it; look back only then.
  let before0: Date | null | undefined;
  const intervalOf = (i: number): number => {
    if ((dueSoon.fraction ?? 0) <= 0) return 0;
    if (i === 0 && before0 === undefined) before0 = previousOccurrence(t.ical, next[0]);
    const prev = i === 0 ? before0 : next[i - 1];
    if (prev) return next[i].getTime() - prev.getTime();
    return i + 1 < next.length ? next[i + 1].getTime() - next[i].getTime() : 0;
  };
  let first = -1;
  let windowMs = 0;
  const scan = () => {
    for (let i = 0; i < next.length; i++) {
      const w = calendarWindowMs(dueSoon, intervalOf(i));
      const coveredEarly = done !== null && done.getTime() >= next[i].getTime() - w;
      if (!coveredEarly) {
        first = i;
        windowMs = w;
        return;
      }
    }
  };
  scan();
  if (first < 0 && next.length === 2) {
    next = expandRecurrence(t.ical, { after, limit: COVER_SCAN });
    scan();
  }
  if (first < 0) {
    return {
      ...base,
      status: 'not-due',
      dueAt: null,
      key: null,
      reason: `calendar: the next ${next.length} occurrences are already covered by the completion at ${iso(done as Date)}`,
      changesAt: null,
    };
  }
  const dueAt = next[first];
  const sinceMs = now.getTime() - dueAt.getTime();
  if (sinceMs >= 0) {
    const latest = previousOccurrence(t.ical, now, { inclusive: true }) ?? dueAt;
    const grace = Math.max(windowMs, MIN_GRACE_MS);
    const status: DueStatus = sinceMs > grace ? 'overdue' : 'due';
    const missed = latest.getTime() !== dueAt.getTime() ? `; latest missed occurrence ${iso(latest)}` : '';
    return {
      ...base,
      status,
      dueAt,
      key: `cal:${iso(latest)}`,
      reason: `calendar occurrence ${iso(dueAt)} ${status === 'overdue' ? `is overdue by ${daysText(sinceMs)}` : 'is due'}${missed}`,
      changesAt: status === 'due' ? justAfter(dueAt.getTime() + grace) : null,
    };
  }
  const soon = -sinceMs <= windowMs;
  return {
    ...base,
    status: soon ? 'due-soon' : 'not-due',
    dueAt,
    key: null,
    reason: `next calendar occurrence ${iso(dueAt)}${soon ? ` is due in ${daysText(-sinceMs)}` : ''}`,
    changesAt: soon ? dueAt : new Date(dueAt.getTime() - windowMs),
  };
}

export function evalFloating(t: Extract<Trigger, { kind: 'calendar-floating' }>, input: PlanInput, index: number): TriggerEvaluation {
  const { now, startedAt, lastDoneAt, dueSoon } = input;
  const anchor = lastDoneAt ?? startedAt;
  const zone = canonicalZone(t.tz);
  // Calendar arithmetic in the plan's zone: "1 month after 31 Jan" is the end of February and
  // "7 days after 09:00" is 09:00 local even across a DST change (luxon plus()).
  const dueAt = DateTime.fromJSDate(anchor, { zone: cachedZone(zone) })
    .plus({ [`${t.unit}s`]: t.every })
    .toJSDate();
  const windowMs = calendarWindowMs(dueSoon, dueAt.getTime() - anchor.getTime());
  const sinceMs = now.getTime() - dueAt.getTime();
  const what = `every ${t.every} ${t.unit}${t.every === 1 ? '' : 's'} since ${lastDoneAt ? 'last done' : 'plan start'} ${iso(anchor)}`;
  const base = { index, kind: t.kind, dueAt } as const;
  if (sinceMs >= 0) {
    const grace = Math.max(windowMs, MIN_GRACE_MS);
    const status: DueStatus = sinceMs > grace ? 'overdue' : 'due';
    return {
      ...base,
      status,
      key: `float:${iso(anchor)}`,
      reason: `${what}: due ${iso(dueAt)}${status === 'overdue' ? `, overdue by ${daysText(sinceMs)}` : ''}`,
      changesAt: status === 'due' ? justAfter(dueAt.getTime() + grace) : null,
    };
  }
  const soon = -sinceMs <= windowMs;
  return {
    ...base,
    status: soon ? 'due-soon' : 'not-due',
    key: null,
    reason: `${what}: due ${iso(dueAt)}`,
    changesAt: soon ? dueAt : new Date(dueAt.getTime() - windowMs),
  };
}
