import type { EntityManager } from '@mikro-orm/postgresql';
import { LockMode } from '@mikro-orm/core';
import { WorkOrder } from './work-order.entity';
import { notFound } from '../../http/errors';

/**
 * Links a lockout/tagout session to a work order. Runs in the caller's unit of work (the safety
 * log's transaction) and uses the caller's shop filter: a work order of another shop is "not found".
 * Applying a new lockout clears an earlier release, so the work order waits for this one.
 */
export async function markLockoutApplied(em: EntityManager, workOrderId: string, lockoutSessionId: string): Promise<void> {
  const wo = await em.findOne(WorkOrder, { id: workOrderId }, { lockMode: em.isInTransaction() ? LockMode.PESSIMISTIC_WRITE : undefined });
  if (!wo) throw notFound('Work order');
  wo.lockoutSessionId = lockoutSessionId;
  wo.lockoutReleasedAt = null;
  await em.flush();
}

/** Records that the lockout for this work order was released; closing needs this when lockout is required. */
export async function markLockoutReleased(em: EntityManager, workOrderId: string, releasedAt: Date): Promise<void> {
  const wo = await em.findOne(WorkOrder, { id: workOrderId }, { lockMode: em.isInTransaction() ? LockMode.PESSIMISTIC_WRITE : undefined });
  if (!wo) throw notFound('Work order');
  wo.lockoutReleasedAt = releasedAt;
  await em.flush();
}
