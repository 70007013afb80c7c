import { z } from 'zod';
import { ROLES, type Role } from '../permissions';
import type { ChecklistTemplateItem } from './plans';
import { paging } from './paging';
import { isoDateTime, oneLine } from './text';

/** Lifecycle: open → in-progress ⇄ on-hold → done; open / in-progress / on-hold → cancelled (with a reason). */
export const WORK_STATES = ['open', 'in-progress', 'on-hold', 'done', 'cancelled'] as const;
export type WorkState = (typeof WORK_STATES)[number];

/** Our own labels for the lifecycle. */
export const WORK_STATE_LABELS: Record<WorkState, string> = {
  open: 'Waiting',
  'in-progress': 'Under way',
  'on-hold': 'Paused',
  done: 'Signed off',
  cancelled: 'Called off',
};

export const WORK_KINDS = ['scheduled', 'condition', 'corrective'] as const;
export type WorkKind = (typeof WORK_KINDS)[number];
export const WORK_KIND_LABELS: Record<WorkKind, string> = {
  scheduled: 'Planned',
  condition: 'Condition',
  corrective: 'Repair',
};

/** Which way a move goes; the server checks it against the lifecycle. */
export const WORK_MOVES = ['start', 'pause', 'resume', 'cancel'] as const;
export type WorkMove = (typeof WORK_MOVES)[number];

export const DUE_FILTERS = ['overdue', 'due', 'due-soon', 'later', 'none'] as const;
export type DueFilter = (typeof DUE_FILTERS)[number];
export const DUE_FILTER_LABELS: Record<DueFilter, string> = {
  overdue: 'Past due',
  due: 'Due now',
  'due-soon': 'Coming up (7 days)',
  later: 'Later',
  none: 'No due date',
};

export const CHECK_RESULTS = ['pass', 'fail', 'na'] as const;
export type CheckResult = (typeof CHECK_RESULTS)[number];
export const CHECK_RESULT_LABELS: Record<CheckResult, string> = { pass: 'OK', fail: 'Not OK', na: 'Not applicable' };

export type ChecklistLine = ChecklistTemplateItem & { result: CheckResult | null; value: number | null; note: string | null };

export const listWorkOrdersQuery = paging.extend({
  machineId: z.uuid().optional(),
  planId: z.uuid().optional(),
  /** 'me' = assigned to me or to my role without a person. */
  assignee: z.union([z.literal('me'), z.literal('unassigned'), z.uuid()]).optional(),
  status: z.enum([...WORK_STATES, 'active']).optional(),
  due: z.enum(DUE_FILTERS).optional(),
  q: z.string().trim().max(100).optional(),
  sort: z.enum(['number', 'dueAt', 'status', 'machine', 'title', 'raisedAt']).default('dueAt'),
  dir: z.enum(['asc', 'desc']).default('asc'),
});
export type ListWorkOrdersQuery = z.infer<typeof listWorkOrdersQuery>;

export type WorkOrderRow = {
  id: string;
  number: number;
  title: string;
  kind: WorkKind;
  status: WorkState;
  dueAt: string | null;
  dueState: DueFilter | 'closed';
  overdue: boolean;
  machine: { id: string; code: string; name: string };
  plan: { id: string; title: string } | null;
  assignee: { id: string; name: string } | null;
  responsibleRole: Role | null;
  requiresLockout: boolean;
  safetyCritical: boolean;
  raisedAt: string;
};

export const raiseWorkOrderInput = z.object({
  machineId: z.uuid({ message: 'Choose a machine' }),
  title: oneLine(z.string().trim().min(3, 'Describe the problem in at least 3 characters').max(160, 'Keep the title under 160 characters')),
  instructions: z.string().trim().max(8000).default(''),
  dueAt: isoDateTime('Enter a valid date and time').nullable().default(null),
  assigneeId: z.uuid().nullable().default(null),
  responsibleRole: z.enum(ROLES).nullable().default('technician'),
  requiresLockout: z.boolean().default(false),
  safetyCritical: z.boolean().default(false),
});
export type RaiseWorkOrderInput = z.infer<typeof raiseWorkOrderInput>;

export const updateWorkOrderInput = z
  .object({
    assigneeId: z.uuid().nullable().optional(),
    dueAt: isoDateTime('Enter a valid date and time').nullable().optional(),
    labourMinutes: z.number().int('Whole minutes').min(0, 'Cannot be negative').max(100_000).optional(),
    notes: z.string().max(8000, 'Notes are too long').optional(),
    requiresLockout: z.boolean().optional(),
  })
  .refine((v) => Object.values(v).some((x) => x !== undefined), { message: 'Nothing to change' });
export type UpdateWorkOrderInput = z.infer<typeof updateWorkOrderInput>;

export const moveWorkOrderInput = z
  .object({ move: z.enum(WORK_MOVES), reason: z.string().trim().max(500).optional() })
  .refine((v) => v.move !== 'cancel' || (v.reason !== undefined && v.reason.length >= 3), { path: ['reason'], message: 'Say why the work is called off' })
  .refine((v) => v.move !== 'pause' || (v.reason !== undefined && v.reason.length >= 3), { path: ['reason'], message: 'Say what the work is waiting for' });
export type MoveWorkOrderInput = z.infer<typeof moveWorkOrderInput>;

export const checklistResultsInput = z.object({
  results: z
    .array(
      z.object({
        key: oneLine(z.string().min(1).max(40)),
        result: z.enum(CHECK_RESULTS).nullable(),
        value: z.number().finite('Enter a number').nullable().default(null),
        note: z.string().trim().max(500).nullable().default(null),
      }),
    )
    .max(60),
});
export type ChecklistResultsInput = z.infer<typeof checklistResultsInput>;

export const usePartInput = z.object({
  partTypeId: z.uuid({ message: 'Choose a part' }),
  quantity: z.number({ message: 'Enter a quantity' }).finite().positive('The quantity must be greater than 0').max(100_000),
});
export type UsePartInput = z.infer<typeof usePartInput>;

export const closeWorkOrderInput = z.object({
  labourMinutes: z.number({ message: 'Enter the time spent' }).int('Whole minutes').min(0, 'Cannot be negative').max(100_000).optional(),
  notes: z.string().max(8000).optional(),
});
export type CloseWorkOrderInput = z.infer<typeof closeWorkOrderInput>;

export const partLineParam = z.object({ id: z.uuid({ message: 'Not a valid id' }), lineId: z.uuid({ message: 'Not a valid id' }) });

export type WorkOrderDetail = {
  id: string;
  number: number;
  title: string;
  instructions: string;
  kind: WorkKind;
  status: WorkState;
  reason: string | null;
  machine: { id: string; code: string; name: string; kind: string };
  plan: { id: string; title: string; nextDueAt: string | null; status: string } | null;
  occurrenceKey: string | null;
  dueAt: string | null;
  dueState: DueFilter | 'closed';
  overdue: boolean;
  raisedAt: string;
  raisedBy: { id: string; name: string } | null;
  assignee: { id: string; name: string } | null;
  responsibleRole: Role | null;
  requiresLockout: boolean;
  safetyCritical: boolean;
  lockoutSessionId: string | null;
  lockoutReleasedAt: string | null;
  checklist: ChecklistLine[];
  plannedParts: { partTypeId: string; quantity: number; partNumber: string; name: string; stockUnit: string }[];
  partsUsed: {
    id: string;
    partTypeId: string;
    partNumber: string;
    name: string;
    category: string;
    quantity: number;
    stockUnit: string;
    at: string;
    by: string | null;
  }[];
  labourMinutes: number;
  notes: string;
  estimatedMinutes: number | null;
  startedAt: string | null;
  holdReason: string | null;
  completedAt: string | null;
  completedBy: { id: string; name: string } | null;
  cancelledAt: string | null;
  cancelReason: string | null;
  /** The station record that did this work, when one did (see the plan's station record). */
  stationRecord: { type: string; id: string; summary: string } | null;
  attachments: { id: string; fileName: string; mimeType: string; size: number; at: string; by: string | null }[];
  history: { at: string; action: string; who: string | null; details: Record<string, unknown> | null }[];
  /** What still stands between this work order and closing it; empty when it can be closed. */
  closeBlockers: string[];
};

export const NOTIFY_MODES = ['immediate', 'daily', 'none'] as const;
export type NotifyMode = (typeof NOTIFY_MODES)[number];
export const NOTIFY_MODE_LABELS: Record<NotifyMode, string> = {
  immediate: 'Each notice as it happens',
  daily: 'One summary each morning',
  none: 'No routine notices',
};
export const notifyPreferenceInput = z.object({
  mode: z.enum(NOTIFY_MODES),
  digestHour: z.number().int().min(0, '0–23').max(23, '0–23').default(6),
});
export type NotifyPreferenceInput = z.infer<typeof notifyPreferenceInput>;
export type NotifyPreference = NotifyPreferenceInput & { timeZone: string };

/** Attachment limits: photos and PDFs only, checked by content, not by name. */
export const ATTACHMENT_MAX_BYTES = 8 * 1024 * 1024;
export const ATTACHMENT_TYPES = ['image/jpeg', 'image/png', 'image/webp', 'application/pdf'] as const;
