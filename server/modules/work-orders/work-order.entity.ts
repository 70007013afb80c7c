import { defineEntity, p, type InferEntity } from '@mikro-orm/core';
import { baseProperties, orgFilter } from '../common/base';
import { Organization } from '../organizations/organization.entity';
import { Machine } from '../machines/machine.entity';
import { User } from '../users/user.entity';
import { PartType, StockMove } from '../stock/stock.entity';
import { MaintenancePlan } from '../plans/plan.entity';
import { ROLES } from '../../../shared/permissions';
import { WORK_KINDS, WORK_STATES, NOTIFY_MODES, type ChecklistLine } from '../../../shared/schemas/work-orders';

/**
 * A piece of work to do on a machine: raised by the due engine for one occurrence of a plan
 * (unique per plan and occurrence key, so a due occurrence is raised exactly once), or by hand.
 */
export const WorkOrder = defineEntity({
  name: 'WorkOrder',
  tableName: 'work_order',
  filters: orgFilter,
  uniques: [{ properties: ['plan', 'occurrenceKey'] }, { properties: ['organization', 'number'] }],
  indexes: [
    { properties: ['organization', 'status', 'dueAt'] },
    { properties: ['assignee', 'status'] },
    { properties: ['machine'] },
    { properties: ['stationRecordId'] },
    // The work-order list's default order (due first, then newest number): its first page is read
    // from the index without sorting the shop's whole history; its count from the index alone.
    {
      name: 'work_order_list_due_index',
      expression: 'create index "work_order_list_due_index" on "work_order" ("organization_id", "due_at", "number" desc)',
    },
    // The due engine's notice step reads only raised work nobody has been told about yet.
    {
      name: 'work_order_unnotified_index',
      expression:
        'create index "work_order_unnotified_index" on "work_order" ("organization_id", "number") where "notified_at" is null and "plan_id" is not null',
    },
  ],
  properties: {
    ...baseProperties,
    organization: () => p.manyToOne(Organization).ref(),
    /** Shop-wide running number shown to people ("WO 1042"). */
    number: p.integer(),
    machine: () => p.manyToOne(Machine).ref(),
    plan: () => p.manyToOne(MaintenancePlan).ref().nullable(),
    occurrenceKey: p.string().length(200).nullable(),
    kind: p.enum([...WORK_KINDS]),
    title: p.string().length(160),
    instructions: p.text().default(''),
    /** Why it was raised (the engine's reason, or the reporter's words). */
    reason: p.text().nullable(),
    status: p.enum([...WORK_STATES]).default('open'),
    dueAt: p.datetime().nullable(),
    overdue: p.boolean().default(false),
    escalatedAt: p.datetime().nullable(),
    /** When the people responsible were told of raised work (the due engine's notice step); null: not yet. */
    notifiedAt: p.datetime().nullable(),
    assignee: () => p.manyToOne(User).ref().nullable(),
    responsibleRole: p.enum([...ROLES]).nullable(),
    raisedBy: () => p.manyToOne(User).ref().nullable(),
    requiresLockout: p.boolean().default(false),
    safetyCritical: p.boolean().default(false),
    /** Set by the safety log when a lockout is applied / released for this work. */
    lockoutSessionId: p.uuid().nullable(),
    lockoutReleasedAt: p.datetime().nullable(),
    checklist: p.json<ChecklistLine[]>(),
    plannedParts: p.json<{ partTypeId: string; quantity: number }[]>(),
    estimatedMinutes: p.integer().nullable(),
    labourMinutes: p.integer().default(0),
    notes: p.text().default(''),
    startedAt: p.datetime().nullable(),
    holdReason: p.string().length(500).nullable(),
    completedAt: p.datetime().nullable(),
    completedBy: () => p.manyToOne(User).ref().nullable(),
    /** The station record that completed this work (a consumable change, cut check, reading or pre-use check). */
    stationRecordType: p.string().length(40).nullable(),
    stationRecordId: p.uuid().nullable(),
    /** What that record said, in words, as it stood when it did the work. */
    stationRecordSummary: p.string().length(300).nullable(),
    cancelledAt: p.datetime().nullable(),
    cancelReason: p.string().length(500).nullable(),
  },
});
export type IWorkOrder = InferEntity<typeof WorkOrder>;

/** A part (or oil, grease) taken from stock for a work order; the stock move is its twin. */
export const WorkOrderPart = defineEntity({
  name: 'WorkOrderPart',
  tableName: 'work_order_part',
  filters: orgFilter,
  indexes: [{ properties: ['workOrder'] }],
  properties: {
    ...baseProperties,
    organization: () => p.manyToOne(Organization).ref(),
    workOrder: () => p.manyToOne(WorkOrder).ref(),
    partType: () => p.manyToOne(PartType).ref(),
    quantity: p.double().$type<number>(),
    stockMove: () => p.manyToOne(StockMove).ref().nullable(),
    by: () => p.manyToOne(User).ref().nullable(),
  },
});
export type IWorkOrderPart = InferEntity<typeof WorkOrderPart>;

/** A photo or PDF kept with a work order. Stored in the database so shop isolation and backups cover it. */
export const WorkOrderAttachment = defineEntity({
  name: 'WorkOrderAttachment',
  tableName: 'work_order_attachment',
  filters: orgFilter,
  indexes: [{ properties: ['workOrder'] }],
  properties: {
    ...baseProperties,
    organization: () => p.manyToOne(Organization).ref(),
    workOrder: () => p.manyToOne(WorkOrder).ref(),
    fileName: p.string().length(200),
    mimeType: p.string().length(60),
    size: p.integer(),
    data: p.blob().lazy(),
    uploadedBy: () => p.manyToOne(User).ref().nullable(),
  },
});
export type IWorkOrderAttachment = InferEntity<typeof WorkOrderAttachment>;

/** Per-shop work order numbers, handed out under a row lock. */
export const WorkOrderCounter = defineEntity({
  name: 'WorkOrderCounter',
  tableName: 'work_order_counter',
  filters: orgFilter,
  properties: {
    ...baseProperties,
    organization: () => p.manyToOne(Organization).ref().unique(),
    lastNumber: p.integer().default(1000),
  },
});

/** How a person wants routine work notices; overdue safety work is always sent. */
export const NotifyPreference = defineEntity({
  name: 'NotifyPreference',
  tableName: 'notify_preference',
  filters: orgFilter,
  uniques: [{ properties: ['organization', 'user'] }],
  properties: {
    ...baseProperties,
    organization: () => p.manyToOne(Organization).ref(),
    user: () => p.manyToOne(User).ref(),
    mode: p.enum([...NOTIFY_MODES]).default('immediate'),
    /** Local hour (site time zone) after which the daily summary goes out. */
    digestHour: p.integer().default(6),
    /** Local date (YYYY-MM-DD) of the last summary sent, so each day gets at most one. */
    lastDigestDate: p.string().length(10).nullable(),
  },
});
export type INotifyPreference = InferEntity<typeof NotifyPreference>;
