import type { EntityManager } from '@mikro-orm/postgresql';
import { LockMode } from '@mikro-orm/core';
import { PurchaseReceipt, PurchaseRequest, type IPurchaseRequest } from './purchasing.entity';
import { PartType, Supplier } from '../stock/stock.entity';
import { applyStockChanges } from '../stock/stock.service';
import type { Principal } from '../../http/principal';
import { conflict, fieldError, notFound } from '../../http/errors';
import { recordActivity } from '../activity-log/activity-log.service';
import { clock } from '../../../shared/clock';
import {
  PURCHASE_STATE_LABELS,
  type PurchaseReceiptInput,
  type PurchaseRequestInput,
  type PurchaseRequestRow,
  type PurchaseState,
  type SupplierInput,
  type SupplierRow,
} from '../../../shared/schemas/purchasing';

const num = (v: number | string) => Number(v);

export async function listSuppliers(em: EntityManager): Promise<SupplierRow[]> {
  const suppliers = await em.find(Supplier, {}, { orderBy: { name: 'asc' } });
  const counts: { supplier_id: string; n: string }[] = suppliers.length
    ? await em.execute('select supplier_id, count(*) as n from part_type where supplier_id = any(?::uuid[]) group by 1', [
        `{${suppliers.map((s) => s.id).join(',')}}`,
      ])
    : [];
  const parts = new Map(counts.map((c) => [c.supplier_id, Number(c.n)]));
  return suppliers.map((s) => ({ id: s.id, name: s.name, email: s.email ?? null, phone: s.phone ?? null, note: s.note ?? null, parts: parts.get(s.id) ?? 0 }));
}

export async function createSupplier(em: EntityManager, who: Principal, input: SupplierInput): Promise<{ id: string }> {
  return em.transactional(async (tx) => {
    if (await tx.findOne(Supplier, { name: input.name }))
      throw conflict(`${input.name} is already a supplier`, [{ path: 'name', message: 'Already a supplier' }]);
    const s = tx.create(Supplier, { organization: who.orgId, ...input });
    recordActivity(tx, who, 'supplier.created', { type: 'Supplier', id: s.id }, { name: input.name });
    return { id: s.id };
  });
}

/** Quantity ordered and not yet received, per part: what "on order" means for the low-stock flag. */
export async function onOrderByPart(em: EntityManager, orgId: string, partIds: string[]): Promise<Map<string, { onOrder: number; pending: number }>> {
  const out = new Map<string, { onOrder: number; pending: number }>();
  if (partIds.length === 0) return out;
  const rows: { part_type_id: string; on_order: string; pending: string }[] = await em.execute(
    `select part_type_id,
            sum(case when status = 'ordered' then quantity - received else 0 end) as on_order,
            sum(case when status in ('requested', 'approved') then quantity else 0 end) as pending
       from purchase_request
      where organization_id = ? and status in ('requested', 'approved', 'ordered') and part_type_id = any(?::uuid[])
      group by 1`,
    [orgId, `{${partIds.join(',')}}`],
  );
  for (const r of rows) out.set(r.part_type_id, { onOrder: Math.max(0, num(r.on_order)), pending: num(r.pending) });
  return out;
}

async function nextNumber(tx: EntityManager, orgId: string): Promise<number> {
  // One numbering per shop; the transaction-scoped lock keeps two requests from taking the same number.
  await tx.execute('select pg_advisory_xact_lock(hashtext(?))', [`purchase-request:${orgId}`]);
  const [row]: { n: number | null }[] = await tx.execute('select max(number) as n from purchase_request where organization_id = ?', [orgId]);
  return (row?.n ?? 0) + 1;
}

export async function raiseRequest(em: EntityManager, who: Principal, input: PurchaseRequestInput): Promise<{ id: string; number: number }> {
  return em.transactional(async (tx) => {
    const part = await tx.findOne(PartType, { id: input.partTypeId });
    if (!part) throw fieldError('partTypeId', 'The part was not found');
    if (!part.active) throw fieldError('partTypeId', `${part.partNumber} is no longer stocked`);
    const number = await nextNumber(tx, who.orgId);
    const r = tx.create(PurchaseRequest, {
      organization: who.orgId,
      number,
      partType: part,
      supplier: part.supplier ?? null,
      status: 'requested',
      quantity: input.quantity,
      received: 0,
      note: input.note,
      requestedBy: who.userId,
    });
    recordActivity(tx, who, 'purchase.requested', { type: 'PurchaseRequest', id: r.id }, { number, partNumber: part.partNumber, quantity: input.quantity });
    return { id: r.id, number };
  });
}

async function lockRequest(tx: EntityManager, id: string, from: PurchaseState[], action: string): Promise<IPurchaseRequest> {
  const r = await tx.findOne(PurchaseRequest, { id }, { lockMode: LockMode.PESSIMISTIC_WRITE });
  if (!r) throw notFound('Purchase request');
  if (!from.includes(r.status)) throw conflict(`Request ${r.number} cannot be ${action}: it is ${PURCHASE_STATE_LABELS[r.status].toLowerCase()}`);
  return r;
}

/** approve: requested → approved; order: approved → ordered; cancel: not yet ordered → cancelled. */
export async function moveRequest(em: EntityManager, who: Principal, id: string, step: 'approve' | 'order' | 'cancel'): Promise<void> {
  await em.transactional(async (tx) => {
    const now = clock.now();
    if (step === 'approve') {
      const r = await lockRequest(tx, id, ['requested'], 'approved');
      Object.assign(r, { status: 'approved', approvedBy: who.userId, approvedAt: now });
    } else if (step === 'order') {
      const r = await lockRequest(tx, id, ['approved'], 'ordered');
      Object.assign(r, { status: 'ordered', orderedBy: who.userId, orderedAt: now });
    } else {
      const r = await lockRequest(tx, id, ['requested', 'approved'], 'called off');
      Object.assign(r, { status: 'cancelled', closedAt: now });
    }
    recordActivity(tx, who, `purchase.${step}`, { type: 'PurchaseRequest', id });
  });
}

/**
 * Parts that came in against an order: a receipt row, the stock raised by the same amount, and
 * the request closed once everything has come in. More than is still open is refused.
 */
export async function receive(
  em: EntityManager,
  who: Principal,
  id: string,
  input: PurchaseReceiptInput,
): Promise<{ received: number; status: PurchaseState }> {
  return em.transactional(async (tx) => {
    const r = await lockRequest(tx, id, ['ordered'], 'received');
    const open = r.quantity - r.received;
    if (input.quantity > open + 1e-9) throw fieldError('quantity', `Only ${open} still open on request ${r.number}`);
    const receipt = tx.create(PurchaseReceipt, {
      organization: who.orgId,
      request: r,
      quantity: input.quantity,
      receivedAt: clock.now(),
      by: who.userId,
      note: input.note,
    });
    await applyStockChanges(tx, who, [
      {
        partTypeId: r.partType.id,
        quantity: input.quantity,
        kind: 'received',
        reason: `Purchase request ${r.number}`,
        ref: { type: 'PurchaseRequest', id: r.id },
      },
    ]);
    r.received += input.quantity;
    if (r.quantity - r.received <= 1e-9) Object.assign(r, { status: 'received', closedAt: clock.now() });
    recordActivity(tx, who, 'purchase.received', { type: 'PurchaseRequest', id: r.id }, { receiptId: receipt.id, quantity: input.quantity });
    return { received: r.received, status: r.status };
  });
}

export async function listRequests(em: EntityManager, status: PurchaseState | 'open'): Promise<PurchaseRequestRow[]> {
  const where = status === 'open' ? { status: { $in: ['requested', 'approved', 'ordered'] as PurchaseState[] } } : { status };
  const rows = await em.find(PurchaseRequest, where, {
    orderBy: { number: 'desc' },
    limit: 200,
    populate: ['partType', 'supplier', 'requestedBy', 'approvedBy', 'orderedBy'],
  });
  const receipts = rows.length
    ? await em.find(PurchaseReceipt, { request: { $in: rows.map((r) => r.id) } }, { orderBy: { receivedAt: 'asc' }, populate: ['by'] })
    : [];
  return rows.map((r) => {
    const p = r.partType.getEntity();
    return {
      id: r.id,
      number: r.number,
      status: r.status,
      part: { id: p.id, partNumber: p.partNumber, name: p.name, stockUnit: p.stockUnit, packSize: p.packSize },
      supplier: r.supplier?.getEntity().name ?? null,
      quantity: r.quantity,
      received: r.received,
      note: r.note ?? null,
      requestedAt: r.createdAt.toISOString(),
      requestedBy: r.requestedBy?.getEntity().name ?? null,
      approvedBy: r.approvedBy?.getEntity().name ?? null,
      orderedAt: r.orderedAt?.toISOString() ?? null,
      orderedBy: r.orderedBy?.getEntity().name ?? null,
      receipts: receipts
        .filter((x) => x.request.id === r.id)
        .map((x) => ({ at: x.receivedAt.toISOString(), quantity: x.quantity, by: x.by?.getEntity().name ?? null })),
    };
  });
}
