import { defineEntity, p, type InferEntity } from '@mikro-orm/core';
import { baseProperties, orgFilter } from '../common/base';
import { Organization } from '../organizations/organization.entity';
import { User } from '../users/user.entity';
import { Machine } from './machine.entity';
import { DOWNTIME_KINDS, MACHINE_STATES } from '../../../shared/schemas/machine-state';
import { FAILURE_CODE_CATEGORIES } from '../../../shared/schemas/failure-codes';

/**
 * One stretch of time a machine could not be used: from the moment it was taken out of service
 * to its return. At most one is open per machine (partial unique index), so taking a machine out
 * twice at once cannot open two.
 */
export const MachineDowntime = defineEntity({
  name: 'MachineDowntime',
  tableName: 'machine_downtime',
  filters: orgFilter,
  indexes: [
    { properties: ['organization', 'startedAt'] },
    { properties: ['machine', 'startedAt'] },
    {
      name: 'machine_downtime_one_open_index',
      expression: 'create unique index "machine_downtime_one_open_index" on "machine_downtime" ("machine_id") where "ended_at" is null',
    },
  ],
  properties: {
    ...baseProperties,
    organization: () => p.manyToOne(Organization).ref(),
    machine: () => p.manyToOne(Machine).ref(),
    kind: p.enum([...DOWNTIME_KINDS]),
    reason: p.string().length(500),
    /** Failure mode, cause and remedy codes from the shop's lists (kept as text: a retired code stays readable). */
    failureCode: p.string().length(12).nullable(),
    causeCode: p.string().length(12).nullable(),
    remedyCode: p.string().length(12).nullable(),
    /** The repair (or planned work) whose completion ends this stop; no foreign key: another module owns work orders. */
    workOrderId: p.uuid().nullable(),
    startedAt: p.datetime(),
    startedBy: () => p.manyToOne(User).ref().nullable(),
    endedAt: p.datetime().nullable(),
    endedBy: () => p.manyToOne(User).ref().nullable(),
    /** The work order whose sign-off ended it, if any. */
    endedByWorkOrderId: p.uuid().nullable(),
  },
});
export type IMachineDowntime = InferEntity<typeof MachineDowntime>;

/** Every change of a machine's service state, in order; never changed once written. */
export const MachineStateChange = defineEntity({
  name: 'MachineStateChange',
  tableName: 'machine_state_change',
  filters: orgFilter,
  indexes: [{ properties: ['machine', 'at'] }],
  properties: {
    ...baseProperties,
    organization: () => p.manyToOne(Organization).ref(),
    machine: () => p.manyToOne(Machine).ref(),
    fromState: p.enum([...MACHINE_STATES]),
    toState: p.enum([...MACHINE_STATES]),
    at: p.datetime(),
    by: () => p.manyToOne(User).ref().nullable(),
    reason: p.string().length(500).nullable(),
    downtime: () => p.manyToOne(MachineDowntime).ref().nullable(),
    workOrderId: p.uuid().nullable(),
  },
});
export type IMachineStateChange = InferEntity<typeof MachineStateChange>;

/** A shop's failure-mode, cause and remedy codes (started from Kerfbook's lists, then the shop's own). */
export const FailureCode = defineEntity({
  name: 'FailureCode',
  tableName: 'failure_code',
  filters: orgFilter,
  uniques: [{ properties: ['organization', 'category', 'code'] }],
  properties: {
    ...baseProperties,
    organization: () => p.manyToOne(Organization).ref(),
    category: p.enum([...FAILURE_CODE_CATEGORIES]),
    code: p.string().length(12),
    label: p.string().length(120),
    active: p.boolean().default(true),
  },
});
export type IFailureCode = InferEntity<typeof FailureCode>;
