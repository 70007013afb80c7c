import type { EntityManager } from '@mikro-orm/postgresql';
import { User } from '../users/user.entity';
import type { ILockoutPoint } from './lockout.entity';
import { clock } from '../../../shared/clock';

/** Marks devices as taken off now by `userId` (release, a test window, an absent employee's removal); returns that moment. */
export function takeOffDevices(tx: EntityManager, points: ILockoutPoint[], userId: string): Date {
  const now = clock.now();
  for (const p of points) {
    p.removedAt = now;
    p.removedBy = tx.getReference(User, userId, { wrapped: true });
  }
  return now;
}
