import { describe, expect, it } from 'vitest';
import { applyLockoutFormSchema, lockoutReasonFromWork } from '../../shared/schemas/safety-lockout';

describe('work to be done, taken from the work order a lockout is applied for', () => {
  it('names the work order by number and title', () => {
    expect(lockoutReasonFromWork({ number: 1042, title: 'Replace the punch station clamp ' })).toBe('WO 1042: Replace the punch station clamp');
  });

  it('stays within what the form accepts, however long the title', () => {
    const reason = lockoutReasonFromWork({ number: 7, title: 'x'.repeat(400) });
    expect(reason).toHaveLength(300);
    const parsed = applyLockoutFormSchema.safeParse({
      procedureId: '00000000-0000-4000-8000-000000000001',
      reason,
      group: false,
      points: [{ sourceKey: 'E1', device: 'lock-and-tag', lockNumber: 'L-12' }],
    });
    expect(parsed.error?.issues.filter((i) => i.path[0] === 'reason') ?? []).toEqual([]);
  });
});
