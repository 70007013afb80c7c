import { z } from 'zod';
import { ROLES, type Role } from '../permissions';
import { paging } from './paging';
import { localDateTime, oneLine } from './text';
import { PART_CATEGORY_LABELS, TORCH_CATEGORIES } from './stock';

/** Plan status as the due engine sees it (shared/domain/due/index.ts DueStatus). */
export const DUE_STATES = ['not-due', 'due-soon', 'due', 'overdue'] as const;
export type DueState = (typeof DUE_STATES)[number];

/**
 * Our own words for the due states; colour follows ISO 3864-1 (see src/features/plans/components/due-badge.tsx)
 * and the text always says it too.
 */
export const DUE_STATE_LABELS: Record<DueState, string> = {
  'not-due': 'On track',
  'due-soon': 'Coming up',
  due: 'Due now',
  overdue: 'Past due',
};

const num = (what: string) => z.number({ message: `Enter ${what}` }).finite(`Enter ${what}`);
const positive = (what: string) => num(what).positive(`${what[0].toUpperCase()}${what.slice(1)} must be greater than 0`);

/** One checklist line: answered pass / fail / not applicable; a 'measure' line also takes a value with limits. */
export const checklistTemplateItem = z
  .object({
    key: z
      .string()
      .trim()
      .min(1)
      .max(40)
      .regex(/^[a-z0-9-]+$/, 'Use lower-case letters, digits and dashes'),
    label: oneLine(z.string().trim().min(2, 'Describe the check').max(200, 'Keep the check under 200 characters')),
    kind: z.enum(['check', 'measure']),
    unit: oneLine(z.string().trim().max(16)).optional(),
    min: num('a lower limit').optional(),
    max: num('an upper limit').optional(),
    /** A failed answer stops the sign-off until repair work is raised or a deviation is signed. */
    safetyCritical: z.boolean().optional(),
  })
  .refine((i) => i.kind === 'check' || (i.unit !== undefined && i.unit !== ''), { path: ['unit'], message: 'A measured value needs a unit' })
  .refine((i) => i.min === undefined || i.max === undefined || i.min <= i.max, { path: ['max'], message: 'The upper limit must not be below the lower limit' });
export type ChecklistTemplateItem = z.infer<typeof checklistTemplateItem>;

export const TRIGGER_KINDS = ['calendar-fixed', 'calendar-floating', 'meter', 'condition', 'oil-analysis'] as const;
export type TriggerKind = (typeof TRIGGER_KINDS)[number];
export const TRIGGER_KIND_LABELS: Record<TriggerKind, string> = {
  'calendar-fixed': 'Fixed calendar (RRULE)',
  'calendar-floating': 'Interval after last done',
  meter: 'Meter interval',
  condition: 'Condition reading crosses a limit',
  'oil-analysis': 'Oil analysis outside targets',
};

/** Form shape of a trigger. The server turns a fixed calendar into DTSTART (site time zone) + RRULE text. */
export const triggerInput = z.discriminatedUnion('kind', [
  z.object({
    kind: z.literal('calendar-fixed'),
    /** Local wall-clock start in the site's time zone, e.g. 2025-01-06T07:00. */
    start: localDateTime('Enter a local start date and time'),
    /** RFC 5545 RRULE value, e.g. FREQ=WEEKLY;BYDAY=MO. */
    rrule: z.string().trim().min(6, 'Enter a rule such as FREQ=WEEKLY;BYDAY=MO').max(400),
  }),
  z.object({
    kind: z.literal('calendar-floating'),
    every: z.number({ message: 'Enter a whole number' }).int('Enter a whole number').min(1, 'Must be at least 1').max(1000),
    unit: z.enum(['day', 'week', 'month']),
  }),
  z.object({
    kind: z.literal('meter'),
    meterId: z.uuid({ message: 'Choose a meter' }),
    every: positive('the meter interval'),
  }),
  z
    .object({
      kind: z.literal('condition'),
      meterId: z.uuid({ message: 'Choose a meter' }),
      above: num('a limit').optional(),
      below: num('a limit').optional(),
    })
    .refine((t) => t.above !== undefined || t.below !== undefined, { path: ['above'], message: 'Give an upper or a lower limit' })
    .refine((t) => t.above === undefined || t.below === undefined || t.below < t.above, {
      path: ['below'],
      message: 'The lower limit must be below the upper limit',
    }),
  z.object({ kind: z.literal('oil-analysis') }),
]);
export type TriggerInput = z.infer<typeof triggerInput>;

/** Stored form: the fixed calendar keeps the RFC 5545 text it was built into. */
export type StoredTrigger = Exclude<TriggerInput, { kind: 'calendar-fixed' }> | { kind: 'calendar-fixed'; start: string; rrule: string; ical: string };

/**
 * The record made at the station that counts as doing the plan's work, so nobody enters it twice:
 * a consumable change of (at least) the given torch parts, a test coupon, a reading of one counter,
 * or a pre-use check of the machine.
 */
export const STATION_RECORD_KINDS = ['consumable-change', 'cut-check', 'counter-reading', 'pre-use-check'] as const;
export type StationRecordKind = (typeof STATION_RECORD_KINDS)[number];
export const STATION_RECORD_LABELS: Record<StationRecordKind, string> = {
  'consumable-change': 'A consumable change at the station',
  'cut-check': 'A test coupon (cut check) at the station',
  'counter-reading': 'A counter reading',
  'pre-use-check': 'A pre-use check of the machine',
};
export const stationRecordRule = z.discriminatedUnion('kind', [
  z.object({
    kind: z.literal('consumable-change'),
    categories: z
      .array(z.enum(TORCH_CATEGORIES, { message: 'Not a torch consumable' }))
      .min(1, 'Choose the parts whose change does this work')
      .max(TORCH_CATEGORIES.length)
      .refine((c) => new Set(c).size === c.length, 'Each part only once'),
  }),
  z.object({ kind: z.literal('cut-check') }),
  z.object({ kind: z.literal('counter-reading'), meterId: z.uuid({ message: 'Choose the counter' }) }),
  z.object({ kind: z.literal('pre-use-check') }),
]);
export type StationRecordRule = z.infer<typeof stationRecordRule>;

/** One line for people: "A consumable change of electrode + nozzle". */
export function stationRecordSummary(rule: StationRecordRule, meterName?: string): string {
  switch (rule.kind) {
    case 'consumable-change':
      return `A consumable change of ${rule.categories.map((c) => PART_CATEGORY_LABELS[c].toLowerCase()).join(' + ')}`;
    case 'counter-reading':
      return `A reading of ${meterName ?? 'its counter'}`;
    default:
      return STATION_RECORD_LABELS[rule.kind];
  }
}

export const planPartInput = z.object({
  partTypeId: z.uuid({ message: 'Choose a part' }),
  quantity: positive('the quantity'),
});

export const planInput = z
  .object({
    machineId: z.uuid({ message: 'Choose a machine' }),
    title: oneLine(z.string().trim().min(3, 'Give the plan a title of at least 3 characters').max(160, 'Keep the title under 160 characters')),
    instructions: z.string().trim().max(8000, 'Instructions are too long').default(''),
    checklist: z.array(checklistTemplateItem).max(60, 'At most 60 checklist lines').default([]),
    estimatedMinutes: z.number().int('Whole minutes').min(1, 'At least 1 minute').max(10_000).nullable().default(null),
    parts: z.array(planPartInput).max(30).default([]),
    responsibleRole: z.enum(ROLES).nullable().default('technician'),
    responsibleUserId: z.uuid().nullable().default(null),
    requiresLockout: z.boolean().default(false),
    safetyCritical: z.boolean().default(false),
    triggers: z.array(triggerInput).min(1, 'Add at least one trigger').max(6, 'At most 6 triggers'),
    dueSoonDays: z.number().min(0, 'Cannot be negative').max(365).nullable().default(3),
    /** Share of the interval counted as "coming up", 0–0.9. */
    dueSoonFraction: z.number().min(0, 'Cannot be negative').max(0.9, 'At most 90 %').nullable().default(0.1),
    active: z.boolean().default(true),
    /** Which station record does this work; null: only a signed-off work order does. */
    stationRecord: stationRecordRule.nullable().default(null),
  })
  .refine((p) => p.responsibleRole !== null || p.responsibleUserId !== null, {
    path: ['responsibleRole'],
    message: 'Choose who is responsible: a role or a person',
  })
  .refine((p) => new Set(p.checklist.map((c) => c.key)).size === p.checklist.length, { path: ['checklist'], message: 'Checklist keys must be unique' });
export type PlanInput = z.infer<typeof planInput>;
export type PlanFormValues = z.input<typeof planInput>;

export const listPlansQuery = paging.extend({
  machineId: z.uuid().optional(),
  status: z.enum(DUE_STATES).optional(),
  q: z.string().trim().max(100).optional(),
  active: z.enum(['true', 'false', 'all']).default('true'),
  sort: z.enum(['title', 'machine', 'status', 'nextDueAt']).default('nextDueAt'),
  dir: z.enum(['asc', 'desc']).default('asc'),
});
export type ListPlansQuery = z.infer<typeof listPlansQuery>;

export type PlanRow = {
  id: string;
  title: string;
  machine: { id: string; code: string; name: string };
  status: DueState;
  nextDueAt: string | null;
  statusReason: string | null;
  triggerSummary: string;
  requiresLockout: boolean;
  safetyCritical: boolean;
  active: boolean;
  lastDoneAt: string | null;
  responsible: string;
};

export type TriggerView = StoredTrigger & { summary: string; meter?: { id: string; code: string; name: string; unit: string } };

export type PlanDetail = {
  id: string;
  machine: { id: string; code: string; name: string; kind: string };
  title: string;
  instructions: string;
  checklist: ChecklistTemplateItem[];
  estimatedMinutes: number | null;
  parts: { partTypeId: string; quantity: number; partNumber: string; name: string; stockUnit: string }[];
  responsibleRole: Role | null;
  responsibleUser: { id: string; name: string } | null;
  requiresLockout: boolean;
  safetyCritical: boolean;
  triggers: TriggerView[];
  dueSoonDays: number | null;
  dueSoonFraction: number | null;
  active: boolean;
  startedAt: string;
  lastDoneAt: string | null;
  status: DueState;
  nextDueAt: string | null;
  statusReason: string | null;
  evaluatedAt: string | null;
  starterKey: string | null;
  stationRecord: (StationRecordRule & { summary: string }) | null;
  /** Per-trigger view from the last evaluation. */
  evaluation: { kind: string; status: DueState; dueAt: string | null; reason: string }[];
  meterDue: { meterId: string; startValue?: number; dueValue: number; current: number | null; forecastAt: string | null }[];
  openWorkOrder: { id: string; number: number; status: string } | null;
  timeZone: string;
};

/** Lists for plan and work-order forms: machines, meters, parts and people of the shop. */
export type PlanLookups = {
  machines: { id: string; code: string; name: string; kind: string; parentId: string | null }[];
  meters: { id: string; machineId: string; code: string; name: string; kind: string; unit: string }[];
  parts: { id: string; partNumber: string; name: string; category: string; stockUnit: string; onHand: number }[];
  people: { userId: string; name: string; role: Role }[];
  timeZone: string;
};

export const applyStartersInput = z.object({
  machineId: z.uuid({ message: 'Choose a machine' }),
  starterKeys: z.array(z.string().min(1).max(60)).min(1, 'Choose at least one starter plan').max(40),
});
export type ApplyStartersInput = z.infer<typeof applyStartersInput>;

/** Query of the starter list: with a machine, each starter says whether it fits that machine. */
export const starterListQuery = z.object({ machineId: z.uuid({ message: 'Choose a machine' }).optional() });

/** fits: every trigger finds its meter; partial: a meter trigger is left out, the rest still work; no: cannot be applied. */
export type StarterFit = { status: 'fits' | 'partial' | 'no'; reason: string | null };

export type StarterView = {
  key: string;
  title: string;
  machineKinds: string[];
  summary: string;
  needsMeters: string[];
  requiresLockout: boolean;
  safetyCritical: boolean;
  /** Only when the list was asked for one machine. */
  fit?: StarterFit;
};

export type ApplyStartersResult = {
  created: { key: string; planId: string; title: string }[];
  skipped: { key: string; title: string; reason: string }[];
};
