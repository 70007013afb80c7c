/** Read side of test or positioning windows for other safety code: the alarm's verified intervals. */
import type { EntityManager } from '@mikro-orm/postgresql';
import { verifiedIntervalsAroundTests } from '../../../shared/domain/lockout-test-windows';

type Verified<T> = T & { id: string; verifiedAt: Date; releasedAt: Date | null };

/**
 * Each verified lockout as its verified intervals: a window (devices off for testing) ends one, the
 * re-verification after it starts the next. Raw SQL naming the shop, as the alarm's other queries.
 */
export async function splitAroundTestWindows<T>(tx: EntityManager, orgId: string, lockouts: Verified<T>[]): Promise<Verified<T>[]> {
  if (lockouts.length === 0) return [];
  const rows = await tx.execute<{ session_id: string; opened_at: Date; reverified_at: Date | null }[]>(
    `select session_id, opened_at, reverified_at from safety_lockout_test_window where organization_id = ? and session_id = any(?::uuid[])`,
    [orgId, `{${lockouts.map((l) => l.id).join(',')}}`],
  );
  return lockouts.flatMap((l) =>
    verifiedIntervalsAroundTests(
      l,
      rows
        .filter((r) => r.session_id === l.id)
        .map((r) => ({ openedAt: new Date(r.opened_at), reverifiedAt: r.reverified_at ? new Date(r.reverified_at) : null })),
    ).map((interval) => ({ ...l, ...interval })),
  );
}

/** Open windows by lockout id, for the machine's state text. */
export async function openTestWindowReasons(em: EntityManager, sessionIds: string[]): Promise<Map<string, { reason: string; since: Date }>> {
  if (sessionIds.length === 0) return new Map();
  const rows = await em
    .getConnection()
    .execute<{ session_id: string; reason: string; opened_at: Date }[]>(
      `select session_id, reason, opened_at from safety_lockout_test_window where session_id = any(?::uuid[]) and reapplied_at is null`,
      [`{${sessionIds.join(',')}}`],
    );
  return new Map(rows.map((r) => [r.session_id, { reason: r.reason, since: new Date(r.opened_at) }]));
}
