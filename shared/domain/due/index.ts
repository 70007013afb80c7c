/**
 * Decision logic of the maintenance due engine: given a plan's triggers ("whichever comes
 * first"), its last completion and the meter readings, say whether work is due and give the
 * occurrence a deterministic key so the server can insert it under a unique constraint and never
 * raise it twice.
 *
 * Rules this module defines (house rules, not from a standard):
 *
 * - Status comes from completion: a trigger stays due until the plan is done again. Raising a
 *   work order does not clear it.
 * - Due-soon window before a due point, and the same window as grace after it:
 *     calendar triggers  window = max(days, fraction × interval)   (interval: between occurrences,
 *                        or N units for a floating trigger); grace = max(window, 1 day)
 *     meter triggers     window = fraction × every (meter units); grace is the same number of
 *                        units, or — without a fraction — max(days, 1 day) since the meter crossed;
 *                        also due-soon when the usage forecast reaches the mark within `days`
 *     condition triggers due-soon within fraction × |limit| of the limit or when the trend reaches
 *                        it within `days`; grace = max(days, 1 day) since the first reading past it
 *   Past the due point by no more than the grace → 'due'; by more → 'overdue'. The 1-day floor keeps
 *   a plan falling due at 09:00 'due' for that day instead of 'overdue' a minute later.
 * - Fixed calendar: an occurrence counts as done if the plan was completed at or after
 *   (occurrence − its due-soon window), so work done early in the window is not asked for again.
 *   Occurrences before the plan's start are ignored.
 * - One current occurrence per plan: after downtime the key is that of the most recent missed
 *   calendar occurrence, not one per missed occurrence; and while a key raised since the last
 *   completion is still current (`lastRaisedKey`), it is returned again, so a second trigger
 *   firing for the same outstanding work does not raise a second work order.
 *
 * - `changesAt`: the earliest instant at which the status can change with time alone (same
 *   triggers, completion and readings). Until then the result stays valid, so the engine can
 *   skip re-evaluating a plan whose inputs did not change. Null when only new input changes it.
 *
 * Pure: no I/O; runs in the browser too.
 */
import type { DueStatus, Evaluation, MeterDue, PlanInput, TriggerEvaluation } from './types';
import { validate } from './inputs';
import { evalFixed, evalFloating } from './calendar';
import { evalCondition, evalMeter } from './meter';

export {
  MIN_GRACE_MS,
  type DueSoonWindow,
  type DueStatus,
  type Evaluation,
  type MeterDue,
  type MeterInput,
  type PlanInput,
  type Reading,
  type Trigger,
  type TriggerEvaluation,
} from './types';

const RANK: Record<DueStatus, number> = { 'not-due': 0, 'due-soon': 1, due: 2, overdue: 3 };

/** Is `key` an occurrence raised since the last completion (so the work it stands for is still open)? */
function isCurrentCycleKey(key: string, input: PlanInput): boolean {
  const done = input.lastDoneAt?.getTime() ?? null;
  const cycleStart = input.lastDoneAt ?? input.startedAt;
  if (key.startsWith('cal:')) {
    const t = Date.parse(key.slice(4));
    return Number.isFinite(t) && t >= input.startedAt.getTime() && (done === null || t > done);
  }
  if (key.startsWith('float:')) return Date.parse(key.slice(6)) === cycleStart.getTime();
  if (key.startsWith('meter:')) {
    const rest = key.slice(6);
    const cut = rest.lastIndexOf(':');
    const m = input.meters[rest.slice(0, cut)];
    const v = Number(rest.slice(cut + 1));
    return cut > 0 && m !== undefined && Number.isFinite(v) && v > m.baseline;
  }
  const c = /^cond:(.+):(\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}\.\d{3}Z)$/.exec(key);
  if (c) {
    const t = Date.parse(c[2]);
    return input.meters[c[1]] !== undefined && (done === null || t > done);
  }
  return false;
}

/**
 * Evaluates a maintenance plan's triggers, whichever comes first. Calendar rules follow
 * RFC 5545 (§3.8.5.3 RRULE via ./recurrence); the meter forecast uses the ordinary least-squares
 * usage rate (NIST e-Handbook §4.4.3.1, via ./forecast). Due-soon, grace and key rules are the
 * house rules in this module's header comment. Throws an Error naming any bad input.
 */
export function evaluatePlan(input: PlanInput): Evaluation {
  validate(input);
  const triggers: TriggerEvaluation[] = [];
  const dueMeter: MeterDue[] = [];
  input.triggers.forEach((t, i) => {
    switch (t.kind) {
      case 'calendar-fixed':
        triggers.push(evalFixed(t, input, i));
        break;
      case 'calendar-floating':
        triggers.push(evalFloating(t, input, i));
        break;
      case 'meter': {
        const r = evalMeter(t, input, i);
        triggers.push(r.evaluation);
        dueMeter.push(r.meter);
        break;
      }
      case 'condition':
        triggers.push(evalCondition(t, input, i));
        break;
    }
  });
  const order = [...triggers].sort(
    (a, b) => RANK[b.status] - RANK[a.status] || (a.dueAt?.getTime() ?? Infinity) - (b.dueAt?.getTime() ?? Infinity) || a.index - b.index,
  );
  const decider = order[0];
  const dueTimes = triggers.map((t) => t.dueAt?.getTime()).filter((x): x is number => x !== undefined);
  const dueAt = dueTimes.length > 0 ? new Date(Math.min(...dueTimes)) : null;
  let occurrenceKey: string | null = null;
  let reason = decider.reason;
  if (decider.status === 'due' || decider.status === 'overdue') {
    const raised = input.lastRaisedKey;
    if (raised !== null && isCurrentCycleKey(raised, input)) {
      occurrenceKey = raised;
      if (raised !== decider.key) reason += ` (work already raised as ${raised})`;
    } else {
      occurrenceKey = decider.key;
    }
  }
  return {
    status: decider.status,
    dueAt,
    dueMeter,
    reason,
    occurrenceKey,
    alreadyRaised: occurrenceKey !== null && occurrenceKey === input.lastRaisedKey,
    decidedBy: decider.index,
    triggers,
    changesAt: earliest(triggers.map((t) => t.changesAt)),
  };
}

function earliest(dates: (Date | null)[]): Date | null {
  let best: Date | null = null;
  for (const d of dates) if (d !== null && (best === null || d.getTime() < best.getTime())) best = d;
  return best;
}
