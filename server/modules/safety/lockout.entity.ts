import { defineEntity, p, type InferEntity } from '@mikro-orm/core';
import { baseProperties, orgFilter } from '../common/base';
import { Organization } from '../organizations/organization.entity';
import { User } from '../users/user.entity';
import { Machine } from '../machines/machine.entity';
import { EnergyProcedure, ProcedureVersion } from './procedure.entity';
import { LOCK_DEVICES, LOCKOUT_STATES } from '../../../shared/schemas/safety-lockout';
import { TAG_ONLY_BASES, TAG_MEASURE_MAX } from '../../../shared/schemas/safety-tag-only';

/** One application of an energy-control procedure, from the first lock on to the last lock off. */
export const LockoutSession = defineEntity({
  name: 'LockoutSession',
  tableName: 'safety_lockout',
  filters: orgFilter,
  indexes: [{ properties: ['organization', 'state'] }],
  properties: {
    ...baseProperties,
    organization: () => p.manyToOne(Organization).ref(),
    machine: () => p.manyToOne(Machine).ref().deleteRule('no action'),
    procedure: () => p.manyToOne(EnergyProcedure).ref(),
    procedureVersion: () => p.manyToOne(ProcedureVersion).ref(),
    /** Optional link to the work order this lockout protects (no foreign key: another module owns it). */
    workOrderId: p.uuid().nullable(),
    reason: p.string().length(300),
    group: p.boolean().default(false),
    state: p.enum([...LOCKOUT_STATES]).default('locked'),
    /** The authorized employee with primary responsibility (OSHA 29 CFR 1910.147(f)(3)(ii)(A)). */
    primary: () => p.manyToOne(User).ref(),
    pendingHandoverTo: () => p.manyToOne(User).ref().nullable(),
    appliedAt: p.datetime(),
    verifiedAt: p.datetime().nullable(),
    releasedAt: p.datetime().nullable(),
  },
});
export type ILockoutSession = InferEntity<typeof LockoutSession>;

/** A device on one isolation point. The holder is the only person who may take it off. */
export const LockoutPoint = defineEntity({
  name: 'LockoutPoint',
  tableName: 'safety_lockout_point',
  filters: orgFilter,
  properties: {
    ...baseProperties,
    organization: () => p.manyToOne(Organization).ref(),
    session: () => p.manyToOne(LockoutSession).ref(),
    sourceKey: p.string().length(8),
    device: p.enum([...LOCK_DEVICES]),
    lockNumber: p.string().length(30),
    tagNumber: p.string().length(30).nullable(),
    /** A tag used alone: why (1910.147(c)(3)) and, for full protection, the additional measure. */
    tagJustification: p.enum([...TAG_ONLY_BASES]).nullable(),
    tagMeasure: p.string().length(TAG_MEASURE_MAX).nullable(),
    appliedBy: () => p.manyToOne(User).ref(),
    holder: () => p.manyToOne(User).ref(),
    appliedAt: p.datetime(),
    removedAt: p.datetime().nullable(),
    removedBy: () => p.manyToOne(User).ref().nullable(),
  },
});
export type ILockoutPoint = InferEntity<typeof LockoutPoint>;

/** A member of a group lockout with their personal lock (1910.147(f)(3)(ii)(D)). */
export const LockoutMember = defineEntity({
  name: 'LockoutMember',
  tableName: 'safety_lockout_member',
  filters: orgFilter,
  properties: {
    ...baseProperties,
    organization: () => p.manyToOne(Organization).ref(),
    session: () => p.manyToOne(LockoutSession).ref(),
    user: () => p.manyToOne(User).ref(),
    lockNumber: p.string().length(30),
    joinedAt: p.datetime(),
    leftAt: p.datetime().nullable(),
  },
});
export type ILockoutMember = InferEntity<typeof LockoutMember>;
