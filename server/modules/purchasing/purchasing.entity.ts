import { defineEntity, p, type InferEntity } from '@mikro-orm/core';
import { baseProperties, orgFilter } from '../common/base';
import { Organization } from '../organizations/organization.entity';
import { User } from '../users/user.entity';
import { PartType, Supplier } from '../stock/stock.entity';
import { PURCHASE_STATES } from '../../../shared/schemas/purchasing';

/** A request to buy one part: raised, approved, ordered, then received (in one or more receipts). */
export const PurchaseRequest = defineEntity({
  name: 'PurchaseRequest',
  tableName: 'purchase_request',
  filters: orgFilter,
  uniques: [{ properties: ['organization', 'number'] }],
  indexes: [{ properties: ['partType', 'status'] }],
  properties: {
    ...baseProperties,
    organization: () => p.manyToOne(Organization).ref(),
    number: p.integer(),
    partType: () => p.manyToOne(PartType).ref(),
    supplier: () => p.manyToOne(Supplier).ref().nullable(),
    status: p.enum([...PURCHASE_STATES]),
    quantity: p.double().$type<number>(),
    /** Sum of the receipts, kept in the same transaction. */
    received: p.double().$type<number>().default(0),
    note: p.string().length(300).nullable(),
    requestedBy: () => p.manyToOne(User).ref().nullable(),
    approvedBy: () => p.manyToOne(User).ref().nullable(),
    approvedAt: p.datetime().nullable(),
    orderedBy: () => p.manyToOne(User).ref().nullable(),
    orderedAt: p.datetime().nullable(),
    closedAt: p.datetime().nullable(),
  },
});
export type IPurchaseRequest = InferEntity<typeof PurchaseRequest>;

/** Parts that came in against a request. Append-only: a wrong receipt is corrected by a stock adjustment. */
export const PurchaseReceipt = defineEntity({
  name: 'PurchaseReceipt',
  tableName: 'purchase_receipt',
  filters: orgFilter,
  properties: {
    ...baseProperties,
    organization: () => p.manyToOne(Organization).ref(),
    request: () => p.manyToOne(PurchaseRequest).ref(),
    quantity: p.double().$type<number>(),
    receivedAt: p.datetime(),
    by: () => p.manyToOne(User).ref().nullable(),
    note: p.string().length(300).nullable(),
  },
});
export type IPurchaseReceipt = InferEntity<typeof PurchaseReceipt>;
