/**
 * Evidence that a machine ran while it was locked out: a cumulative counter (strokes, arc starts,
 * running hours) that rose between two readings both taken inside a verified lockout.
 *
 * Source: OSHA 29 CFR 1910.147(d)(6) — once isolation is verified the machine must not be able to
 * operate, so any advance of its own counters while the devices are on means either the machine
 * ran (a device was defeated or removed) or an energy source feeding it is missing from the
 * procedure. Readings that straddle the verification or the release are not evidence: the count
 * may have risen before the devices went on or after they came off. Pure; runs in the browser too.
 */
export type LockoutWindow = { verifiedAt: Date; releasedAt: Date | null };
export type CounterReading = { at: Date; value: number };
export type CounterAdvance = { from: CounterReading; to: CounterReading; advance: number };

export function meterAdvancesDuringLockouts(lockouts: LockoutWindow[], readings: CounterReading[], now: Date): CounterAdvance[] {
  const sorted = [...readings].sort((a, b) => a.at.getTime() - b.at.getTime());
  const out: CounterAdvance[] = [];
  for (let i = 1; i < sorted.length; i++) {
    const from = sorted[i - 1];
    const to = sorted[i];
    if (!(from.at.getTime() < to.at.getTime()) || !(to.value > from.value)) continue;
    const inside = lockouts.some((l) => {
      const end = (l.releasedAt ?? now).getTime();
      return l.verifiedAt.getTime() <= from.at.getTime() && to.at.getTime() <= end;
    });
    if (inside) out.push({ from, to, advance: to.value - from.value });
  }
  return out;
}
