/**
 * The verified intervals of one lockout, split around its test or positioning windows.
 *
 * Source: OSHA 29 CFR 1910.147(f)(1) — when lockout devices must be removed temporarily to test or
 * position the machine, the machine is energized on purpose between the removal (f)(1)(iii) and
 * the reapplication of energy control (f)(1)(v). During that time a moving counter is expected,
 * not evidence that a device was defeated. Isolation is proved again (1910.147(d)(6)) before work
 * resumes, so a verified interval ends when a window opens and the next one starts only at the
 * re-verification; a window not yet re-verified has no interval after it. Pure; runs in the browser too.
 */
import type { LockoutWindow } from './lockout-conflicts';

export type TestWindowSpan = { openedAt: Date; reverifiedAt: Date | null };

export function verifiedIntervalsAroundTests(lockout: LockoutWindow, windows: TestWindowSpan[]): LockoutWindow[] {
  const sorted = [...windows].sort((a, b) => a.openedAt.getTime() - b.openedAt.getTime());
  const out: LockoutWindow[] = [];
  let start: Date | null = lockout.verifiedAt;
  for (const w of sorted) {
    if (start && w.openedAt.getTime() >= start.getTime()) out.push({ verifiedAt: start, releasedAt: w.openedAt });
    start = w.reverifiedAt;
  }
  if (start) out.push({ verifiedAt: start, releasedAt: lockout.releasedAt });
  return out;
}
