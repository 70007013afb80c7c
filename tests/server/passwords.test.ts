import { afterEach, describe, expect, it, vi } from 'vitest';
import argon2 from 'argon2';
import { hashPassword, verifyPassword } from '../../server/modules/auth/passwords';

afterEach(() => vi.restoreAllMocks());

describe('password hashing under a burst', () => {
  it('runs at most two argon2 computations at once and answers every caller', async () => {
    let active = 0;
    let most = 0;
    vi.spyOn(argon2, 'verify').mockImplementation(async (_hash: string, password: string | Buffer) => {
      active++;
      most = Math.max(most, active);
      await new Promise((r) => setTimeout(r, 20));
      active--;
      return password === 'right';
    });
    const answers = await Promise.all(Array.from({ length: 12 }, (_, i) => verifyPassword('$argon2id$stored', i % 3 === 0 ? 'right' : 'wrong')));
    expect(most).toBeLessThanOrEqual(2);
    expect(most).toBeGreaterThan(0);
    expect(answers.filter(Boolean)).toHaveLength(4);
  });

  it('frees its slot when a computation throws, so later callers still run', async () => {
    vi.spyOn(argon2, 'verify').mockRejectedValue(new Error('malformed hash'));
    expect(await Promise.all(Array.from({ length: 5 }, () => verifyPassword('not-a-hash', 'x')))).toEqual(Array(5).fill(false));
    vi.restoreAllMocks();
    // The real library, after the failures: a hash and its check still go through.
    const hash = await hashPassword('kerfbook-demo');
    expect(await verifyPassword(hash, 'kerfbook-demo')).toBe(true);
    expect(await verifyPassword(hash, 'other')).toBe(false);
  });
});
