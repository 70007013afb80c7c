/**
 * The one clock of the server, the demo seed and the shared schemas. Everything asks it for
 * "now"; tests and tools move it with `setClock` (a shift that keeps running, like faketime's
 * relative offset) instead of depending on the hour, weekday or date the suite happens to run.
 * Durations measured on this machine (latency, rate-limit windows) keep using `Date.now()`.
 * Luxon follows it where `./luxon-clock` is loaded (the server, the seed, the tests and every
 * shared module that uses luxon); the browser never moves the clock, so its pages need not load luxon.
 */
let offsetMs = 0;

export const clock = {
  /** Milliseconds since the epoch, as `Date.now()`. */
  ms: (): number => Date.now() + offsetMs,
  now: (): Date => new Date(Date.now() + offsetMs),
};

/** Runs the clock as if it had been `at` just now (it keeps ticking from there); `null` resets it. */
export function setClock(at: Date | string | null): void {
  offsetMs = at === null ? 0 : new Date(at).getTime() - Date.now();
}
