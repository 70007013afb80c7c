// A plan's reason, as the due evaluation writes it, rewritten for people: meter names for ids and
// the shop's local time (shared/locale.ts, held to luxon in locale.test.ts) for UTC instants.
import { describe, expect, it } from 'vitest';
import { humanReason } from '../../server/modules/plans/plan-reason';

describe('humanReason', () => {
  it('rewrites ids and instants of a reason for people', () => {
    const meter = '0b9a7c3e-1111-4222-8333-444455556666';
    const text = humanReason(
      `meter ${meter} reads 120, due at 100 (every 100 from 0); calendar occurrence 2026-03-09T12:00:00.000Z is due (work already raised as cal:2026-03-09T12:00:00.000Z)`,
      (id) => (id === meter ? { name: 'Arc starts', unit: 'starts' } : undefined),
      { timeZone: 'America/Chicago', locale: 'en-US' },
    );
    // 9 Mar 2026 is after the US change to daylight time (8 Mar; Energy Policy Act of 2005, §110): CDT, UTC−5.
    expect(text).toBe('Arc starts reads 120, due at 100 (every 100 from 0); calendar occurrence 9 Mar 2026, 07:00 is due (work already raised)');
  });

  it('writes the minutes of the shop clock either side of a change (8 Mar 2026 in Chicago: 01:59 CST, then 03:00 CDT)', () => {
    const shop = { timeZone: 'America/Chicago', locale: 'en-US' };
    expect(humanReason('next occurrence 2026-03-08T07:59:00.000Z', () => undefined, shop)).toBe('next occurrence 8 Mar 2026, 01:59');
    expect(humanReason('next occurrence 2026-03-08T08:00:00.000Z', () => undefined, shop)).toBe('next occurrence 8 Mar 2026, 03:00');
  });
});
