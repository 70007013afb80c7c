import { describe, expect, it } from 'vitest';
import { meterAdvancesDuringLockouts } from '../../shared/domain/lockout-conflicts';

// OSHA 29 CFR 1910.147(d)(6): after isolation is verified the machine must not operate, so its own
// counters must not rise until the devices come off; the cases below are worked by hand.
const t = (hh: number, mm = 0) => new Date(Date.UTC(2027, 2, 10, hh, mm));
const r = (hh: number, mm: number, value: number) => ({ at: t(hh, mm), value });
const now = t(23);

describe('meterAdvancesDuringLockouts', () => {
  it('reports a rise between two readings both inside a verified lockout, with the amount', () => {
    const lockouts = [{ verifiedAt: t(8), releasedAt: t(12) }];
    const found = meterAdvancesDuringLockouts(lockouts, [r(7, 0, 100), r(9, 0, 120), r(10, 0, 135), r(13, 0, 200)], now);
    // 1910.147(d)(6): 120 → 135 lies wholly between verification (08:00) and release (12:00).
    expect(found).toEqual([{ from: { at: t(9), value: 120 }, to: { at: t(10), value: 135 }, advance: 15 }]);
  });

  it('does not count a pair that straddles the verification or the release', () => {
    const lockouts = [{ verifiedAt: t(8), releasedAt: t(12) }];
    // 07:00 → 09:00 crosses the verification; 11:00 → 13:00 crosses the release: neither is evidence.
    expect(meterAdvancesDuringLockouts(lockouts, [r(7, 0, 100), r(9, 0, 150)], now)).toEqual([]);
    expect(meterAdvancesDuringLockouts(lockouts, [r(11, 0, 150), r(13, 0, 160)], now)).toEqual([]);
  });

  it('includes the boundaries themselves: a reading at the verification and one at the release', () => {
    const lockouts = [{ verifiedAt: t(8), releasedAt: t(12) }];
    expect(meterAdvancesDuringLockouts(lockouts, [r(8, 0, 10), r(12, 0, 11)], now)).toEqual([
      { from: { at: t(8), value: 10 }, to: { at: t(12), value: 11 }, advance: 1 },
    ]);
  });

  it('treats a lockout not yet released as running until now', () => {
    const open = [{ verifiedAt: t(8), releasedAt: null }];
    expect(meterAdvancesDuringLockouts(open, [r(9, 0, 5), r(22, 0, 6)], now)).toHaveLength(1);
    // A reading after "now" is outside the window.
    expect(meterAdvancesDuringLockouts(open, [r(9, 0, 5), r(23, 30, 6)], now)).toEqual([]);
  });

  it('ignores equal or falling values and sorts readings by time first', () => {
    const lockouts = [{ verifiedAt: t(8), releasedAt: t(18) }];
    const readings = [r(12, 0, 40), r(9, 0, 40), r(10, 0, 40), r(11, 0, 3)];
    // In time order: 40, 40, 3 (a reset), 40 → only 3 → 40 rises.
    expect(meterAdvancesDuringLockouts(lockouts, readings, now)).toEqual([{ from: { at: t(11), value: 3 }, to: { at: t(12), value: 40 }, advance: 37 }]);
  });

  it('reports nothing without a lockout, and one entry per pair across two lockouts', () => {
    expect(meterAdvancesDuringLockouts([], [r(9, 0, 1), r(10, 0, 2)], now)).toEqual([]);
    const two = [
      { verifiedAt: t(8), releasedAt: t(10) },
      { verifiedAt: t(14), releasedAt: t(16) },
    ];
    const found = meterAdvancesDuringLockouts(two, [r(8, 30, 1), r(9, 30, 2), r(12, 0, 9), r(14, 30, 9), r(15, 0, 12)], now);
    expect(found.map((f) => f.advance)).toEqual([1, 3]);
  });
});
