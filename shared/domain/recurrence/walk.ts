/**
 * The walk over a prepared rule in wall-clock order (COUNT, UNTIL, gap policy, scan cap), and the
 * window of instants kept for rules asked about many times.
 */
import { Frequency } from '../rrule';
import { DAY_MS, MAX_RECURRENCE_SCAN, SLACK_MS, fail } from './types';
import { instantToWall, wallToInstant } from './zone';
import { skipAheadRule, type OccurrenceWindow, type Prepared } from './prepare';

export interface Visit {
  wallMs: number;
  /** Instant in ms, or null when not converted (far below the range of interest). */
  ms: number | null;
}

/**
 * Walks the recurrence set in wall-clock order, applying COUNT, UNTIL and the gap policy.
 * `lowWall`: below this wall time conversion may be skipped (when it cannot matter).
 * The visitor returns false to stop.
 */
export function walk(prep: Prepared, lowWall: number, visit: (v: Visit) => boolean, skipAhead = false, skipTo = lowWall): { skipped: boolean; ended: boolean } {
  const { internal, zone, policy } = prep;
  const skipped = skipAhead ? skipAheadRule(prep, Math.min(skipTo, lowWall)) : null;
  const rule = skipped ?? prep.rule;
  const { count, until } = internal.parsed;
  // Under 'skip' a gap instance is not part of the set, so every instance must be checked.
  const mustConvertAll = policy === 'skip';
  let produced = 0;
  let scanned = 0;
  let stopped = false;
  let visitorStopped = false;
  rule.all((d) => {
    if (stopped) return false;
    scanned++;
    if (scanned > MAX_RECURRENCE_SCAN) {
      fail(`expansion scanned more than ${MAX_RECURRENCE_SCAN} instances; narrow the rule or move DTSTART closer`);
    }
    const wallMs = d.getTime();
    let ms: number | null = null;
    const needConvert = mustConvertAll || wallMs >= lowWall || until?.kind === 'utc';
    if (needConvert) {
      const r = wallToInstant(wallMs, zone);
      if (r.gap && policy === 'skip') return true; // RFC 5545 §3.3.10: ignored and not counted
      ms = r.ms;
    }
    if (until) {
      const within = until.kind === 'utc' ? (ms as number) <= until.instantMs : wallMs <= until.wallMs;
      if (!within) {
        // Past UNTIL in wall order; the instant test can only flip back within the slack.
        if (wallMs > (until.kind === 'utc' ? instantToWall(until.instantMs, zone) : until.wallMs) + SLACK_MS) {
          stopped = true;
          return false;
        }
        return true;
      }
    }
    produced++;
    if (count !== null && produced > count) {
      stopped = true;
      return false;
    }
    if (!visit({ wallMs, ms })) {
      stopped = true;
      visitorStopped = true;
      return false;
    }
    return true;
  });
  // `ended`: the rule ran out (UNTIL, COUNT or its last instance) before the visitor stopped it.
  return { skipped: skipped !== null, ended: !visitorStopped };
}

/** Rough length of one FREQ×INTERVAL period, for looking back a few periods. */
export function periodMs(prep: Prepared): number {
  const interval = prep.skipBase?.interval ?? 1;
  switch (prep.skipBase?.freq) {
    case Frequency.DAILY:
      return interval * DAY_MS;
    case Frequency.WEEKLY:
      return 7 * interval * DAY_MS;
    default:
      return 31 * interval * DAY_MS;
  }
}

// Rules asked about many times (plans share rule texts) are answered from a window of their
// instants around the last question, instead of a fresh rrule walk per question.
const WINDOW_AFTER_USES = 3;
const WINDOW_SPAN_MS = 500 * DAY_MS;
const WINDOW_MAX_INSTANTS = 2048;

function buildWindow(prep: Prepared, aroundWall: number): OccurrenceWindow {
  const fromWall = aroundWall - WINDOW_SPAN_MS;
  let toWall = aroundWall + WINDOW_SPAN_MS;
  const ms: number[] = [];
  // rrule yields days in order but a day's times as the rule lists them, so the walk goes on a
  // slack past toWall before it can be sure no instant at or before toWall is still to come.
  const { ended } = walk(
    prep,
    fromWall,
    (v) => {
      if (v.wallMs > toWall + SLACK_MS) return false;
      if (v.wallMs < fromWall || v.ms === null) return true;
      if (ms.length >= WINDOW_MAX_INSTANTS && toWall === aroundWall + WINDOW_SPAN_MS) {
        // Dense rule: end the window well before this instant.
        toWall = Math.max(fromWall, v.wallMs - SLACK_MS);
      }
      ms.push(v.ms);
      return true;
    },
    true,
  );
  ms.sort((a, b) => a - b);
  const unique = ms.filter((x, i) => i === 0 || x !== ms[i - 1]);
  return { fromWall, toWall, complete: ended, fromStart: fromWall <= prep.internal.startWallMs, ms: unique };
}

/** The rule's window when it is worth having (built or rebuilt around `aroundWall`), else null. */
function windowFor(prep: Prepared, aroundWall: number, covers: (w: OccurrenceWindow) => boolean): OccurrenceWindow | null {
  // Only rules the walk can start near any time (DAILY, WEEKLY, MONTHLY without COUNT): building a
  // window for the others would mean walking from DTSTART.
  if (prep.skipBase === null) return null;
  prep.uses++;
  if (prep.window && covers(prep.window)) return prep.window;
  if (prep.uses < WINDOW_AFTER_USES || !Number.isFinite(aroundWall)) return null;
  const w = buildWindow(prep, aroundWall);
  prep.window = w;
  return covers(w) ? w : null;
}

/** First index in sorted `xs` whose value is > x, or >= x when `orEqual`. */
function firstAbove(xs: number[], x: number, orEqual: boolean): number {
  let lo = 0;
  let hi = xs.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (orEqual ? xs[mid] >= x : xs[mid] > x) hi = mid;
    else lo = mid + 1;
  }
  return lo;
}

/**
 * expandRecurrence from the window, or null when the window cannot prove the answer complete.
 * Offsets differ by less than SLACK_MS, so an instant after `after` has a wall time above
 * afterWall − SLACK_MS, and one missing beyond toWall has an instant above toWall − SLACK_MS.
 */
export function expandFromWindow(
  prep: Prepared,
  afterMs: number,
  afterWall: number,
  beforeMs: number | null,
  inclusive: boolean,
  limit: number,
): number[] | null {
  const w = windowFor(prep, afterWall, (x) => x.fromWall <= afterWall - SLACK_MS);
  if (w === null) return null;
  const out: number[] = [];
  for (let i = firstAbove(w.ms, afterMs, inclusive); i < w.ms.length && out.length < limit; i++) {
    const ms = w.ms[i];
    if (beforeMs !== null && (inclusive ? ms > beforeMs : ms >= beforeMs)) break;
    out.push(ms);
  }
  if (w.complete) return out;
  const safeUpTo = w.toWall - SLACK_MS;
  if (out.length === limit && out[out.length - 1] < safeUpTo) return out;
  if (beforeMs !== null && beforeMs < safeUpTo) return out;
  return null;
}

/** previousOccurrence from the window, or null when the window cannot prove the answer (see above). */
export function previousFromWindow(prep: Prepared, atMs: number, atWall: number, inclusive: boolean): { ms: number | null } | null {
  const w = windowFor(prep, atWall, (x) => x.complete || atMs < x.toWall - SLACK_MS);
  if (w === null) return null;
  const i = firstAbove(w.ms, atMs, !inclusive) - 1;
  const best = i >= 0 ? w.ms[i] : null;
  if (w.fromStart || (best !== null && best > w.fromWall + SLACK_MS)) return { ms: best };
  return null;
}
