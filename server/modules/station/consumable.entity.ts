import { defineEntity, p, type InferEntity } from '@mikro-orm/core';
import { baseProperties, orgFilter } from '../common/base';
import { Organization } from '../organizations/organization.entity';
import { Machine } from '../machines/machine.entity';
import { User } from '../users/user.entity';
import { PartType } from '../stock/stock.entity';
import { REMOVAL_REASONS } from '../../../shared/schemas/consumables';
import { TORCH_CATEGORIES } from '../../../shared/schemas/stock';

/** One visit to the torch: which parts came out and the counters at that moment (why, per part, on each install). */
export const ConsumableChange = defineEntity({
  name: 'ConsumableChange',
  tableName: 'consumable_change',
  filters: orgFilter,
  indexes: [{ properties: ['torch', 'changedAt'] }],
  properties: {
    ...baseProperties,
    organization: () => p.manyToOne(Organization).ref(),
    torch: () => p.manyToOne(Machine).ref(),
    changedAt: p.datetime(),
    startsReading: p.double().$type<number>().nullable(),
    arcHoursReading: p.double().$type<number>().nullable(),
    /** Electrode pit depth measured when it came out. */
    pitDepthMm: p.double().$type<number>().nullable(),
    note: p.string().length(500).nullable(),
    by: () => p.manyToOne(User).ref().nullable(),
  },
});
export type IConsumableChange = InferEntity<typeof ConsumableChange>;

/**
 * A part sitting in a torch position from one change to the next. While installed,
 * `removedAt` is empty; at removal its life is the counter advance since installation.
 */
export const ConsumableInstall = defineEntity({
  name: 'ConsumableInstall',
  tableName: 'consumable_install',
  filters: orgFilter,
  indexes: [{ properties: ['torch', 'removedAt'] }, { properties: ['partType', 'removedAt'] }],
  properties: {
    ...baseProperties,
    organization: () => p.manyToOne(Organization).ref(),
    torch: () => p.manyToOne(Machine).ref(),
    partType: () => p.manyToOne(PartType).ref(),
    category: p.enum([...TORCH_CATEGORIES]),
    installedAt: p.datetime(),
    installChange: () => p.manyToOne(ConsumableChange).ref().nullable(),
    startsAtInstall: p.double().$type<number>().nullable(),
    arcHoursAtInstall: p.double().$type<number>().nullable(),
    removedAt: p.datetime().nullable(),
    removalChange: () => p.manyToOne(ConsumableChange).ref().nullable(),
    /** Why this part came out (see REMOVAL_REASON_KIND for how it counts in the life statistics). */
    removalReason: p.enum([...REMOVAL_REASONS]).nullable(),
    lifeStarts: p.double().$type<number>().nullable(),
    lifeArcHours: p.double().$type<number>().nullable(),
  },
});
export type IConsumableInstall = InferEntity<typeof ConsumableInstall>;

/** A photo taken at a change (the electrode pit, a blown nozzle). Kept in the database, checked to be an image. */
export const ConsumablePhoto = defineEntity({
  name: 'ConsumablePhoto',
  tableName: 'consumable_photo',
  filters: orgFilter,
  properties: {
    ...baseProperties,
    organization: () => p.manyToOne(Organization).ref(),
    change: () => p.oneToOne(ConsumableChange).owner().ref(),
    mimeType: p.string().length(40),
    byteSize: p.integer(),
    data: p.blob(),
  },
});
export type IConsumablePhoto = InferEntity<typeof ConsumablePhoto>;

export type CutDimension = { label: string; nominalMm: number; measuredMm: number };

/** A test coupon measured against nominal, tied to the consumables in the torch at the time. */
export const CutCheck = defineEntity({
  name: 'CutCheck',
  tableName: 'cut_check',
  filters: orgFilter,
  indexes: [{ properties: ['torch', 'checkedAt'] }],
  properties: {
    ...baseProperties,
    organization: () => p.manyToOne(Organization).ref(),
    torch: () => p.manyToOne(Machine).ref(),
    checkedAt: p.datetime(),
    toleranceMm: p.double().$type<number>(),
    dimensions: p.json<CutDimension[]>(),
    maxDeviationMm: p.double().$type<number>(),
    passed: p.boolean(),
    /** The installations in the torch when the coupon was cut. */
    installIds: p.json<string[]>(),
    by: () => p.manyToOne(User).ref().nullable(),
    note: p.string().length(500).nullable(),
  },
});
export type ICutCheck = InferEntity<typeof CutCheck>;
