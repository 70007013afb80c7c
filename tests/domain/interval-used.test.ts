import { describe, expect, it } from 'vitest';
import { intervalUsed } from '../../shared/domain/plan-summary';

// Hand-computed: (current − start) ÷ (due − start), clamped to 0…1 (plain arithmetic; common practice
// for the share of a usage-based interval consumed).
describe('share of a meter interval used', () => {
  it('reads 0 right after the work was done, however high the meter stands', () => {
    // Done at 12 000 h, every 500 h: due at 12 500 h. 12 000 / 12 500 would have read 96 %.
    expect(intervalUsed(12_000, 12_000, 12_500)).toBe(0);
    // 2 h run since: 2 ÷ 500 = 0.004.
    expect(intervalUsed(12_002, 12_000, 12_500)).toBeCloseTo(0.004, 10);
  });

  it('grows linearly through the interval', () => {
    expect(intervalUsed(12_250, 12_000, 12_500)).toBe(0.5); // 250 ÷ 500
    expect(intervalUsed(12_495, 12_000, 12_500)).toBeCloseTo(0.99, 10); // 495 ÷ 500
    expect(intervalUsed(1_300, 1_000, 1_500)).toBeCloseTo(0.6, 10); // 300 ÷ 500
    expect(intervalUsed(80_000, 50_000, 100_000)).toBeCloseTo(0.6, 10); // arc starts: 30 000 ÷ 50 000
  });

  it('stays within 0…1: past the mark is full, no reading or a reading below the start is empty', () => {
    expect(intervalUsed(12_600, 12_000, 12_500)).toBe(1);
    expect(intervalUsed(12_500, 12_000, 12_500)).toBe(1);
    expect(intervalUsed(null, 12_000, 12_500)).toBe(0);
    expect(intervalUsed(11_900, 12_000, 12_500)).toBe(0);
    // A zero-length interval (bad data) is full once reached, never a division by zero.
    expect(intervalUsed(10, 10, 10)).toBe(1);
    expect(intervalUsed(9, 10, 10)).toBe(0);
  });
});
