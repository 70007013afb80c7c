import { Settings } from 'luxon';

/**
 * The one clock of the server, the demo seed and the shared schemas. Everything asks it for
 * "now"; tests and tools move it with `setClock` (a shift that keeps running, like faketime's
 * relative offset) instead of depending on the hour, weekday or date the suite happens to run.
 * Durations measured on this machine (latency, rate-limit windows) keep using `Date.now()`.
 */
let offsetMs = 0;

export const clock = {
  /** Milliseconds since the epoch, as `Date.now()`. */
  ms: (): number => Date.now() + offsetMs,
  now: (): Date => new Date(Date.now() + offsetMs),
};

// Luxon's DateTime.now() reads the same clock.
Settings.now = clock.ms;

/** Runs the clock as if it had been `at` just now (it keeps ticking from there); `null` resets it. */
export function setClock(at: Date | string | null): void {
  offsetMs = at === null ? 0 : new Date(at).getTime() - Date.now();
}
