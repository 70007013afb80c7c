import type { MikroORM } from '@mikro-orm/postgresql';

/** Keys for pg advisory locks; one per kind of exclusive work. */
export const LOCKS = { scheduledPass: 724_001 } as const;

/**
 * Runs `fn` only if this process wins the PostgreSQL advisory lock `key`, so that one
 * instance at a time runs the pass. Returns null when another holder has it.
 * The lock is transaction-scoped: it is released when the transaction ends, even if the
 * process dies.
 */
export async function withAdvisoryLock<T>(orm: MikroORM, key: number, fn: () => Promise<T>): Promise<T | null> {
  const em = orm.em.fork();
  return em.transactional(async (tx) => {
    const [row] = await tx.execute<{ locked: boolean }[]>('select pg_try_advisory_xact_lock(?) as locked', [key]);
    if (!row?.locked) return null;
    return fn();
  });
}
