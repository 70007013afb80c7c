// Micro-benchmark of RRULE expansion as the due engine calls it (shared/domain/recurrence/):
//   npx tsx bench/recurrence.ts        (BENCH_CALLS=10000)
// Typical weekly/monthly rules in a DST zone with DTSTART 1-3 years back; each "evaluation" is what
// evalFixed does for a plan done recently: the next two occurrences after a completion, and the
// latest occurrence at or before now. Prints ms per evaluation.
import { performance } from 'node:perf_hooks';
import { buildRecurrenceText, expandRecurrence, previousOccurrence } from '../shared/domain/recurrence';

const CALLS = Number(process.env.BENCH_CALLS ?? 10_000);
const DAY = 86_400_000;
const now = new Date('2026-12-01T12:00:00Z');
const rules = [
  'FREQ=WEEKLY;BYDAY=MO',
  'FREQ=WEEKLY;BYDAY=TU,TH',
  'FREQ=WEEKLY;INTERVAL=2;BYDAY=WE',
  'FREQ=MONTHLY;BYDAY=1MO',
  'FREQ=MONTHLY;BYMONTHDAY=15',
  'FREQ=MONTHLY;BYDAY=MO,TU,WE,TH,FR;BYSETPOS=-1',
  'FREQ=DAILY;INTERVAL=3',
];
const zones = ['America/Chicago', 'Europe/Berlin', 'Australia/Sydney'];
const icals: string[] = [];
for (let y = 1; y <= 3; y++) {
  for (const tzid of zones) {
    for (const [i, rrule] of rules.entries()) {
      const start = new Date(now.getTime() - y * 365 * DAY - i * DAY).toISOString().slice(0, 10);
      icals.push(buildRecurrenceText({ start: `${start}T0${6 + (i % 3)}:00`, tzid, rrule }));
    }
  }
}

function run(n: number): number {
  let sink = 0;
  for (let i = 0; i < n; i++) {
    const ical = icals[i % icals.length];
    const after = new Date(now.getTime() - (i % 90) * DAY);
    sink += expandRecurrence(ical, { after, limit: 2 }).length;
    sink += previousOccurrence(ical, now, { inclusive: true })?.getTime() ? 1 : 0;
  }
  return sink;
}

run(Math.min(500, CALLS)); // warm-up (JIT), not timed
const t0 = performance.now();
run(CALLS);
const ms = performance.now() - t0;
console.log(`${CALLS} evaluations (${icals.length} distinct rules): ${ms.toFixed(0)} ms, ${(ms / CALLS).toFixed(4)} ms/evaluation`);
