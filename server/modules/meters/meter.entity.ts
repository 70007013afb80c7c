import { defineEntity, p, type InferEntity } from '@mikro-orm/core';
import { baseProperties, orgFilter } from '../common/base';
import { Organization } from '../organizations/organization.entity';
import { Machine } from '../machines/machine.entity';
import { User } from '../users/user.entity';
import { METER_KINDS } from '../../../shared/schemas/machines';

export const Meter = defineEntity({
  name: 'Meter',
  tableName: 'meter',
  filters: orgFilter,
  uniques: [{ properties: ['machine', 'code'] }],
  properties: {
    ...baseProperties,
    organization: () => p.manyToOne(Organization).ref(),
    machine: () => p.manyToOne(Machine).ref(),
    /** Stable key used by CSV imports and plans, e.g. "arc-starts", "pump-hours". */
    code: p.string().length(40),
    name: p.string().length(120),
    kind: p.enum([...METER_KINDS]),
    unit: p.string().length(16),
    /** Condition meters: the alarm limits shown beside readings. */
    lowerLimit: p.double().$type<number>().nullable(),
    upperLimit: p.double().$type<number>().nullable(),
  },
});
export type IMeter = InferEntity<typeof Meter>;

export const MeterReading = defineEntity({
  name: 'MeterReading',
  tableName: 'meter_reading',
  filters: orgFilter,
  indexes: [{ properties: ['meter', 'readAt'] }],
  uniques: [{ properties: ['meter', 'importKey'] }],
  properties: {
    ...baseProperties,
    organization: () => p.manyToOne(Organization).ref(),
    meter: () => p.manyToOne(Meter).ref(),
    value: p.double().$type<number>(),
    readAt: p.datetime(),
    source: p.enum(['manual', 'import', 'work-order', 'consumable-change'] as const),
    /** A count that starts again from zero (meter replaced or reset) is recorded as such. */
    isReset: p.boolean().default(false),
    note: p.string().length(300).nullable(),
    recordedBy: () => p.manyToOne(User).ref().nullable(),
    /** Idempotent imports: the same row of the same file maps to the same key. */
    importKey: p.string().length(64).nullable(),
  },
});
export type IMeterReading = InferEntity<typeof MeterReading>;
