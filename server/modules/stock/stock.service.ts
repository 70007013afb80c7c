import type { EntityManager } from '@mikro-orm/postgresql';
import { LockMode } from '@mikro-orm/core';
import { PartType, StockMove } from './stock.entity';
import { badRequest, notFound } from '../../http/errors';
import type { Principal } from '../../http/principal';
import type { StockMoveKind } from '../../../shared/schemas/stock';

export type StockChange = { partTypeId: string; quantity: number; kind: StockMoveKind; reason?: string | null; ref?: { type: string; id: string } };

/**
 * Applies stock changes inside the caller's transaction. Rows are locked (FOR UPDATE) so two
 * people taking the last part at once cannot both succeed. Stock never goes below zero:
 * taking more than is on hand fails with a message naming the part.
 * Must be called inside `em.transactional`.
 */
export async function applyStockChanges(em: EntityManager, who: Pick<Principal, 'userId' | 'orgId'>, changes: StockChange[]) {
  const moves = [];
  for (const c of changes) {
    if (!Number.isFinite(c.quantity) || c.quantity === 0) throw badRequest(`Quantity for part ${c.partTypeId} must be a non-zero number`);
    const part = await em.findOne(PartType, { id: c.partTypeId }, { lockMode: LockMode.PESSIMISTIC_WRITE });
    if (!part) throw notFound('Part');
    const after = part.onHand + c.quantity;
    if (after < -1e-9) {
      throw badRequest(`Not enough ${part.name} (${part.partNumber}) in stock: ${part.onHand} ${part.stockUnit} on hand, ${-c.quantity} needed`, [
        { path: 'quantity', message: `Only ${part.onHand} ${part.stockUnit} of ${part.name} in stock` },
      ]);
    }
    part.onHand = Math.max(0, after);
    moves.push(
      em.create(StockMove, {
        organization: who.orgId,
        partType: part,
        kind: c.kind,
        quantity: c.quantity,
        onHandAfter: part.onHand,
        reason: c.reason ?? null,
        by: who.userId,
        refType: c.ref?.type ?? null,
        refId: c.ref?.id ?? null,
      }),
    );
  }
  return moves;
}
