import { defineEntity, p, type InferEntity } from '@mikro-orm/core';
import { baseProperties, orgFilter } from '../common/base';
import { Organization } from '../organizations/organization.entity';
import { User } from '../users/user.entity';
import { LIFE_UNITS, PART_CATEGORIES, STOCK_MOVE_KINDS } from '../../../shared/schemas/stock';

/** A catalogue entry: a consumable, tool or supply the shop stocks. */
export const PartType = defineEntity({
  name: 'PartType',
  tableName: 'part_type',
  filters: orgFilter,
  uniques: [{ properties: ['organization', 'partNumber'] }],
  properties: {
    ...baseProperties,
    organization: () => p.manyToOne(Organization).ref(),
    partNumber: p.string().length(60),
    name: p.string().length(160),
    category: p.enum([...PART_CATEGORIES]),
    /** Unit stock is counted in: pcs, L, kg … */
    stockUnit: p.string().length(16).default('pcs'),
    lifeUnit: p.enum([...LIFE_UNITS]).nullable(),
    expectedLife: p.double().$type<number>().nullable(),
    unitCost: p.decimal('number').precision(12).scale(2).default(0),
    /** What a planned change costs (part, fitting time); empty = the unit cost. */
    plannedChangeCost: p.decimal('number').precision(12).scale(2).nullable(),
    /** What a failure in service costs (part, scrapped sheet, damaged torch parts, downtime). */
    failureCost: p.decimal('number').precision(12).scale(2).nullable(),
    /** Kept equal to the sum of this part's stock moves, in the same transaction. */
    onHand: p.double().$type<number>().default(0),
    leadTimeDays: p.integer().default(7),
    serviceLevel: p.double().$type<number>().default(0.95),
    active: p.boolean().default(true),
  },
});
export type IPartType = InferEntity<typeof PartType>;

/** Stock changes are records (who, why, how many), never a bare overwrite of on-hand. */
export const StockMove = defineEntity({
  name: 'StockMove',
  tableName: 'stock_move',
  filters: orgFilter,
  indexes: [{ properties: ['partType', 'createdAt'] }],
  properties: {
    ...baseProperties,
    organization: () => p.manyToOne(Organization).ref(),
    partType: () => p.manyToOne(PartType).ref(),
    kind: p.enum([...STOCK_MOVE_KINDS]),
    quantity: p.double().$type<number>(),
    onHandAfter: p.double().$type<number>(),
    reason: p.string().length(300).nullable(),
    by: () => p.manyToOne(User).ref().nullable(),
    /** What caused it, e.g. { type: 'WorkOrder', id } or { type: 'ConsumableChange', id }. */
    refType: p.string().length(60).nullable(),
    refId: p.uuid().nullable(),
  },
});
export type IStockMove = InferEntity<typeof StockMove>;
