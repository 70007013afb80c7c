/**
 * Reliability figures of one machine (or one failure code) over a window, with the terms of
 * EN 13306:2017 "Maintenance — Maintenance terminology" and IEC 60050-192:2015 "International
 * Electrotechnical Vocabulary — Part 192: Dependability" (entry numbers from memory):
 *
 * - operating time: the window less every stop (failure or planned);
 * - MTBF, mean operating time between failures (IEC 60050-192-05-13): operating time / failures;
 * - MTTR, mean time to restoration (IEC 60050-192-07-23): failure downtime / failures (the time
 *   recorded from stop to return, which includes waiting for parts and people, not only repair);
 * - availability (EN 13306, 4.1 family): operating time / (window − planned downtime), i.e. the
 *   share of the time the machine was meant to run that it could run.
 *
 * Stops are clipped to the window (one that began before it counts with the part inside it) and
 * overlapping or touching records of the same kind are one stop. Failure and planned time that
 * overlap count once in the operating time.
 *
 * Pure module: no I/O, runs on the server and in the browser.
 */

export type DowntimeKind = 'failure' | 'planned';
export type DowntimeInput = { start: Date | string; end: Date | string | null; kind: DowntimeKind };
export type ReliabilityInput = { from: Date | string; to: Date | string; downtimes: DowntimeInput[] };
export type ReliabilityFigures = {
  failures: number;
  operatingHours: number;
  mtbfHours: number | null;
  mttrHours: number | null;
  availability: number | null;
  failureDowntimeHours: number;
  plannedDowntimeHours: number;
  windowHours: number;
};

const HOUR_MS = 3_600_000;

function ms(value: Date | string, what: string): number {
  const t = value instanceof Date ? value.getTime() : Date.parse(value);
  if (!Number.isFinite(t)) throw new RangeError(`${what} is not a valid date (got ${String(value)})`);
  return t;
}

type Span = [number, number];

/** Sorts and joins overlapping or touching spans. */
export function mergeSpans(spans: Span[]): Span[] {
  const sorted = [...spans].sort((a, b) => a[0] - b[0]);
  const out: Span[] = [];
  for (const [s, e] of sorted) {
    const last = out[out.length - 1];
    if (last && s <= last[1]) last[1] = Math.max(last[1], e);
    else out.push([s, e]);
  }
  return out;
}

const total = (spans: Span[]) => spans.reduce((sum, [s, e]) => sum + (e - s), 0);

/** Clipped, merged stops of each kind inside the window (an open stop runs to the window's end). */
export function clippedStops(input: ReliabilityInput): { from: number; to: number; failure: Span[]; planned: Span[] } {
  const from = ms(input.from, 'The window start');
  const to = ms(input.to, 'The window end');
  if (to <= from) throw new RangeError('The window must end after it starts');
  const byKind: Record<DowntimeKind, Span[]> = { failure: [], planned: [] };
  input.downtimes.forEach((d, i) => {
    const s = ms(d.start, `Stop ${i + 1}'s start`);
    const e = d.end === null ? to : ms(d.end, `Stop ${i + 1}'s end`);
    if (e < s) throw new RangeError(`Stop ${i + 1} ends before it starts`);
    if (d.kind !== 'failure' && d.kind !== 'planned') throw new RangeError(`Stop ${i + 1} has an unknown kind ${String(d.kind)}`);
    const cs = Math.max(s, from);
    const ce = Math.min(e, to);
    if (ce > cs) byKind[d.kind].push([cs, ce]);
  });
  return { from, to, failure: mergeSpans(byKind.failure), planned: mergeSpans(byKind.planned) };
}

export function reliabilityFigures(input: ReliabilityInput): ReliabilityFigures {
  const { from, to, failure, planned } = clippedStops(input);
  const windowMs = to - from;
  const allDown = total(mergeSpans([...failure, ...planned]));
  const operatingMs = windowMs - allDown;
  const failureMs = total(failure);
  const plannedMs = total(planned);
  const failures = failure.length;
  const meantToRunMs = windowMs - plannedMs;
  return {
    failures,
    operatingHours: operatingMs / HOUR_MS,
    mtbfHours: failures ? operatingMs / failures / HOUR_MS : null,
    mttrHours: failures ? failureMs / failures / HOUR_MS : null,
    availability: meantToRunMs > 0 ? operatingMs / meantToRunMs : null,
    failureDowntimeHours: failureMs / HOUR_MS,
    plannedDowntimeHours: plannedMs / HOUR_MS,
    windowHours: windowMs / HOUR_MS,
  };
}
