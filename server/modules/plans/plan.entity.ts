import { defineEntity, p, type InferEntity } from '@mikro-orm/core';
import { baseProperties, orgFilter } from '../common/base';
import { Organization } from '../organizations/organization.entity';
import { Machine } from '../machines/machine.entity';
import { User } from '../users/user.entity';
import { ROLES } from '../../../shared/permissions';
import { DUE_STATES, type ChecklistTemplateItem, type StationRecordRule, type StoredTrigger } from '../../../shared/schemas/plans';

/** Meter value the plan counts from, per meter id; set when the plan starts and at every completion. */
export type MeterBaselines = Record<string, { value: number; at: string }>;

/** Last evaluation per trigger, kept so screens can explain a status without re-running the engine. */
export type StoredEvaluation = {
  triggers: { kind: string; status: (typeof DUE_STATES)[number]; dueAt: string | null; reason: string }[];
  meterDue: { meterId: string; startValue?: number; dueValue: number; current: number | null; forecastAt: string | null }[];
};

/** A recurring piece of maintenance or safety work on one machine or component. */
export const MaintenancePlan = defineEntity({
  name: 'MaintenancePlan',
  tableName: 'maintenance_plan',
  filters: orgFilter,
  indexes: [{ properties: ['organization', 'machine'] }, { properties: ['organization', 'status', 'nextDueAt'] }],
  properties: {
    ...baseProperties,
    organization: () => p.manyToOne(Organization).ref(),
    machine: () => p.manyToOne(Machine).ref(),
    title: p.string().length(160),
    instructions: p.text().default(''),
    checklist: p.json<ChecklistTemplateItem[]>(),
    estimatedMinutes: p.integer().nullable(),
    parts: p.json<{ partTypeId: string; quantity: number }[]>(),
    responsibleRole: p.enum([...ROLES]).nullable(),
    responsibleUser: () => p.manyToOne(User).ref().nullable(),
    requiresLockout: p.boolean().default(false),
    /** Safety work: overdue notices are mandatory and also go to the safety officer. */
    safetyCritical: p.boolean().default(false),
    triggers: p.json<StoredTrigger[]>(),
    dueSoonDays: p.double().$type<number>().nullable(),
    dueSoonFraction: p.double().$type<number>().nullable(),
    active: p.boolean().default(true),
    startedAt: p.datetime(),
    lastDoneAt: p.datetime().nullable(),
    /** Occurrence key of the last work order raised (see shared/domain/due.ts). */
    lastRaisedKey: p.string().length(200).nullable(),
    meterBaselines: p.json<MeterBaselines>(),
    starterKey: p.string().length(60).nullable(),
    /** The station record that does this work (see shared/schemas/plans.ts); null: only a signed-off work order. */
    stationRecord: p.json<StationRecordRule>().nullable(),
    // Cached result of the last evaluation, written by the due engine.
    status: p.enum([...DUE_STATES]).default('not-due'),
    nextDueAt: p.datetime().nullable(),
    statusReason: p.text().nullable(),
    evaluatedAt: p.datetime().nullable(),
    evaluation: p.json<StoredEvaluation>().nullable(),
    /** Evaluate again no later than this (due.ts changesAt); null: at the next pass. */
    recheckAt: p.datetime().nullable(),
    /** Newest meter reading or oil sample the last evaluation saw; a newer one means evaluate again. */
    inputsAt: p.datetime().nullable(),
    /** Digest of status, next due, reason and evaluation: a pass that finds the same answer skips the write. */
    statusHash: p.string().length(40).nullable(),
  },
});
export type IMaintenancePlan = InferEntity<typeof MaintenancePlan>;
