/** Outside personnel's locks on a lockout, read by the release step (kept apart so lockout.service need not import the outside-personnel service). */
import type { EntityManager } from '@mikro-orm/postgresql';
import { conflict } from '../../http/errors';

/** A lockout is not released while an outside crew's locks are on it (1910.147(f)(2)): they take theirs off first, witnessed and signed. */
export async function requireNoOutsideLocks(tx: EntityManager, sessionId: string): Promise<void> {
  const rows = await tx.execute<{ company: string; lead_name: string; locks: string[] }[]>(
    `select company, lead_name, lock_numbers as locks from safety_outside_party
      where session_id = ? and locks_applied_at is not null and locks_removed_at is null order by created_at`,
    [sessionId],
  );
  if (rows.length)
    throw conflict(
      `Outside personnel's locks are still on this lockout: ${rows.map((r) => `${r.company} (${r.locks.join(', ')}, lead ${r.lead_name})`).join('; ')}. Their lead removes them first, witnessed and signed in the outside personnel panel.`,
      [{ path: 'outsideLocks', message: `Still on: ${rows.flatMap((r) => r.locks).join(', ')}` }],
    );
}
