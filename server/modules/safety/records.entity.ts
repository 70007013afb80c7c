import { defineEntity, p, type InferEntity } from '@mikro-orm/core';
import { baseProperties, orgFilter } from '../common/base';
import { Organization } from '../organizations/organization.entity';
import { User } from '../users/user.entity';
import { Machine } from '../machines/machine.entity';
import { EnergyProcedure } from './procedure.entity';
import { SafetySignOff } from './sign-off.entity';
import { CHECK_CADENCES, type PpeItem } from '../../../shared/schemas/safety-ppe';
import { TASK_KINDS, TRAINING_KINDS } from '../../../shared/schemas/safety-records';

/** PPE a task at a machine needs; shade and hearing protection are derived from arc current and noise. */
export const PpeRequirement = defineEntity({
  name: 'PpeRequirement',
  tableName: 'safety_ppe_requirement',
  filters: orgFilter,
  properties: {
    ...baseProperties,
    organization: () => p.manyToOne(Organization).ref(),
    machine: () => p.manyToOne(Machine).ref().deleteRule('no action'),
    task: p.string().length(120),
    items: p.json<PpeItem[]>(),
    otherItems: p.json<string[]>(),
    arcCurrentA: p.double().$type<number>().nullable(),
    noise: p.json<{ levelDbA: number; hours: number }[]>(),
    peakDbC: p.double().$type<number>().nullable(),
    protectorNrr: p.double().$type<number>().nullable(),
    cadence: p.enum([...CHECK_CADENCES]).default('shift'),
    active: p.boolean().default(true),
  },
});
export type IPpeRequirement = InferEntity<typeof PpeRequirement>;

export const PpeCheck = defineEntity({
  name: 'PpeCheck',
  tableName: 'safety_ppe_check',
  filters: orgFilter,
  indexes: [{ properties: ['machine', 'checkedAt'] }],
  properties: {
    ...baseProperties,
    organization: () => p.manyToOne(Organization).ref(),
    machine: () => p.manyToOne(Machine).ref().deleteRule('no action'),
    requirement: () => p.manyToOne(PpeRequirement).ref(),
    person: () => p.manyToOne(User).ref(),
    checkedAt: p.datetime(),
    items: p.json<string[]>(),
    signOff: () => p.manyToOne(SafetySignOff).ref().deleteRule('no action'),
  },
});
export type IPpeCheck = InferEntity<typeof PpeCheck>;

/** The periodic inspection of a procedure (OSHA 29 CFR 1910.147(c)(6)). */
export const PeriodicInspection = defineEntity({
  name: 'PeriodicInspection',
  tableName: 'safety_inspection',
  filters: orgFilter,
  properties: {
    ...baseProperties,
    organization: () => p.manyToOne(Organization).ref(),
    procedure: () => p.manyToOne(EnergyProcedure).ref(),
    procedureVersion: p.integer(),
    inspectedOn: p.date(),
    inspector: () => p.manyToOne(User).ref(),
    employees: p.json<{ id: string; name: string }[]>(),
    findings: p.text(),
    deviations: p.text().nullable(),
    performedSignOff: () => p.manyToOne(SafetySignOff).ref().deleteRule('no action'),
    certifiedAt: p.datetime().nullable(),
    certifiedBy: () => p.manyToOne(User).ref().nullable(),
    certifySignOff: () => p.manyToOne(SafetySignOff).ref().nullable().deleteRule('no action'),
  },
});
export type IPeriodicInspection = InferEntity<typeof PeriodicInspection>;

/** Training of one person on one procedure version (1910.147(c)(7)). */
export const TrainingRecord = defineEntity({
  name: 'TrainingRecord',
  tableName: 'safety_training',
  filters: orgFilter,
  properties: {
    ...baseProperties,
    organization: () => p.manyToOne(Organization).ref(),
    person: () => p.manyToOne(User).ref(),
    procedure: () => p.manyToOne(EnergyProcedure).ref(),
    procedureVersion: p.integer(),
    kind: p.enum([...TRAINING_KINDS]),
    trainedOn: p.date(),
    trainer: () => p.manyToOne(User).ref(),
    note: p.string().length(500).nullable(),
    signOff: () => p.manyToOne(SafetySignOff).ref().deleteRule('no action'),
  },
});
export type ITrainingRecord = InferEntity<typeof TrainingRecord>;

/** Fire watch after hot work; the end time follows the site's chosen rule. */
export const FireWatch = defineEntity({
  name: 'FireWatch',
  tableName: 'safety_fire_watch',
  filters: orgFilter,
  properties: {
    ...baseProperties,
    organization: () => p.manyToOne(Organization).ref(),
    machine: () => p.manyToOne(Machine).ref().deleteRule('no action'),
    watcher: () => p.manyToOne(User).ref(),
    cuttingEndedAt: p.datetime(),
    until: p.datetime(),
    rule: p.string().length(40),
    area: p.string().length(200).nullable(),
    endedAt: p.datetime().nullable(),
    startSignOff: () => p.manyToOne(SafetySignOff).ref().deleteRule('no action'),
    endSignOff: () => p.manyToOne(SafetySignOff).ref().nullable().deleteRule('no action'),
  },
});
export type IFireWatch = InferEntity<typeof FireWatch>;

/**
 * Safety work raised by the scheduled pass: one row per occurrence (unique key), so a
 * due inspection or missed PPE check is raised and mailed once, and closed when done.
 */
export const SafetyTask = defineEntity({
  name: 'SafetyTask',
  tableName: 'safety_task',
  filters: orgFilter,
  uniques: [{ properties: ['organization', 'kind', 'occurrenceKey'] }],
  properties: {
    ...baseProperties,
    organization: () => p.manyToOne(Organization).ref(),
    kind: p.enum([...TASK_KINDS]),
    occurrenceKey: p.string().length(200),
    title: p.string().length(300),
    machine: () => p.manyToOne(Machine).ref().nullable().deleteRule('set null'),
    dueAt: p.datetime().nullable(),
    status: p.enum(['due', 'overdue', 'done'] as const).default('due'),
    raisedAt: p.datetime(),
    overdueMailedAt: p.datetime().nullable(),
    closedAt: p.datetime().nullable(),
  },
});
export type ISafetyTask = InferEntity<typeof SafetyTask>;
