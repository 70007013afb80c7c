/**
 * What a plan row stores from an evaluation (shared/domain/due.ts evaluatePlan): its status cache,
 * the explanation in people's words and the next re-check. Both writers of these columns use it:
 * the scheduled pass (server/jobs) and a request that re-evaluates one plan (plan-evaluation.ts).
 */
import { createHash } from 'node:crypto';
import type { Evaluation } from '../../../shared/domain/due';

/**
 * "Time alone will not change this" (due.ts changesAt is null), stored as a far date: a null
 * recheck time means "evaluate at the next pass" (new, edited, or work still to raise).
 */
export const NO_TIME_BOUNDARY = new Date('9999-12-31T00:00:00.000Z');

/** A due occurrence this evaluation has not raised yet. */
export const pendingRaise = (ev: Evaluation) => ev.occurrenceKey !== null && !ev.alreadyRaised;

/** What the plan row stores from an evaluation (status cache, explanation in people's words, next re-check). */
export function statusColumns(ev: Evaluation, human: (s: string) => string = (s) => s) {
  return {
    status: ev.status,
    nextDueAt: ev.dueAt,
    statusReason: human(ev.reason),
    recheckAt: ev.changesAt ?? NO_TIME_BOUNDARY,
    evaluation: {
      triggers: ev.triggers.map((t) => ({ kind: t.kind, status: t.status, dueAt: t.dueAt?.toISOString() ?? null, reason: human(t.reason) })),
      meterDue: ev.dueMeter.map((m) => ({
        meterId: m.meterId,
        startValue: m.startValue,
        dueValue: m.dueValue,
        current: m.current,
        forecastAt: m.forecastAt?.toISOString() ?? null,
      })),
    },
  };
}

/**
 * Digest of everything the shown status is made from: the evaluation, the shop's time zone and the
 * names of the plan's meters (reasons are written with them). Stored with the status, so a pass
 * that works out the same again leaves the row alone without rewriting its reasons. Every writer of
 * the status columns stores it.
 */
export function evaluationHash(ev: Evaluation, timeZone: string, meterNames: string[]): string {
  const ms = (d: Date | null) => (d === null ? '' : String(d.getTime()));
  let text = `${ev.status}|${ms(ev.dueAt)}|${ev.reason}|${timeZone}|${meterNames.join('\u0001')}`;
  for (const t of ev.triggers) text += `|${t.kind}|${t.status}|${ms(t.dueAt)}|${t.reason}`;
  for (const m of ev.dueMeter) text += `|${m.meterId}|${m.dueValue}|${m.current}|${ms(m.forecastAt)}`;
  return createHash('sha1').update(text).digest('base64');
}
