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
  // One index for both jobs: lookups by meter and time, and idempotent imports (the key
  // hashes the time, so a key never repeats at another time: unique per meter and key).
  uniques: [{ properties: ['meter', 'readAt', 'importKey'] }],
  properties: {
    ...baseProperties,
    // No foreign keys on these three: triggers check them once per statement instead of once
    // per row (a counter import inserts up to a million rows), with the same guarantees and
    // the meter's shop matching the reading's (migrations/Migration20261205180002.ts).
    organization: () => p.manyToOne(Organization).ref().createForeignKeyConstraint(false),
    meter: () => p.manyToOne(Meter).ref().createForeignKeyConstraint(false),
    value: p.double().$type<number>(),
    readAt: p.datetime(),
    source: p.enum(['manual', 'import', 'work-order', 'consumable-change'] as const),
    /** A count that starts again from zero (meter replaced or reset) is recorded as such. */
    isReset: p.boolean().default(false),
    note: p.string().length(300).nullable(),
    recordedBy: () => p.manyToOne(User).ref().nullable().createForeignKeyConstraint(false),
    /** Idempotent imports: SHA-256 (32 bytes) of meter, time, value and reset; null for readings not imported. */
    importKey: p.blob().nullable(),
  },
});
export type IMeterReading = InferEntity<typeof MeterReading>;
