import { describe, it, expect } from 'vitest';
import { verifiedIntervalsAroundTests } from '../../shared/domain/lockout-test-windows';
import { meterAdvancesDuringLockouts } from '../../shared/domain/lockout-conflicts';

const at = (hhmm: string) => new Date(`2027-04-06T${hhmm}:00Z`);

describe('verified intervals split around test windows', () => {
  // OSHA 29 CFR 1910.147(f)(1)(iii)-(v): energized on purpose from the removal of the devices until isolation is verified again.
  it('ends an interval at each window and starts the next at its re-verification', () => {
    const lockout = { verifiedAt: at('09:00'), releasedAt: at('12:00') };
    const out = verifiedIntervalsAroundTests(lockout, [
      { openedAt: at('10:30'), reverifiedAt: at('11:00') },
      { openedAt: at('09:30'), reverifiedAt: at('10:00') },
    ]);
    expect(out).toEqual([
      { verifiedAt: at('09:00'), releasedAt: at('09:30') },
      { verifiedAt: at('10:00'), releasedAt: at('10:30') },
      { verifiedAt: at('11:00'), releasedAt: at('12:00') },
    ]);
  });

  it('has no interval after a window that is not re-verified yet, and keeps an open lockout open', () => {
    expect(verifiedIntervalsAroundTests({ verifiedAt: at('09:00'), releasedAt: null }, [{ openedAt: at('09:30'), reverifiedAt: null }])).toEqual([
      { verifiedAt: at('09:00'), releasedAt: at('09:30') },
    ]);
    expect(verifiedIntervalsAroundTests({ verifiedAt: at('09:00'), releasedAt: null }, [])).toEqual([{ verifiedAt: at('09:00'), releasedAt: null }]);
  });

  it('fed to the running-while-locked check, an advance inside the window is not evidence, one after re-verification is', () => {
    // OSHA 29 CFR 1910.147(d)(6): after verification the machine must not operate.
    const intervals = verifiedIntervalsAroundTests({ verifiedAt: at('09:00'), releasedAt: null }, [{ openedAt: at('09:30'), reverifiedAt: at('10:00') }]);
    const readings = [
      { at: at('09:10'), value: 100 },
      { at: at('09:40'), value: 104 },
      { at: at('09:50'), value: 108 },
      { at: at('10:10'), value: 108 },
      { at: at('10:20'), value: 111 },
    ];
    const advances = meterAdvancesDuringLockouts(intervals, readings, at('11:00'));
    expect(advances.map((a) => [a.from.value, a.to.value])).toEqual([[108, 111]]);
    // Without the split every one of those advances would read as the machine running under locks.
    expect(meterAdvancesDuringLockouts([{ verifiedAt: at('09:00'), releasedAt: null }], readings, at('11:00'))).toHaveLength(3);
  });
});
