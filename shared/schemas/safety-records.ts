import { z } from 'zod';
import { signPassword } from './safety-sign-offs';
import { isoDateTime, isoDate, oneLine } from './text';

// Periodic inspections, training, fire watch, site settings and the safety work list.

export const inspectionSchema = z.object({
  procedureId: z.uuid({ message: 'Choose the procedure' }),
  inspectedOn: isoDate('Enter the inspection date', { refusedIfFuture: true }),
  employeeIds: z.array(z.uuid()).min(1, 'Include at least one employee who uses the procedure').max(50),
  findings: z.string().trim().min(3, 'Describe what you saw').max(2000),
  deviations: z.string().trim().max(2000).optional(),
  /** Who the deviations concern; each is sent back to training. */
  deviationEmployeeIds: z.array(z.uuid()).max(50).default([]),
  responsibilitiesReviewed: z.literal(true, { message: 'Review each employee’s responsibilities with them (1910.147(c)(6)(i)(C))' }),
  password: signPassword,
});
export type InspectionInput = z.infer<typeof inspectionSchema>;

export const certifySchema = z.object({ password: signPassword });

export type InspectionRow = {
  id: string;
  procedureId: string;
  procedureTitle: string;
  procedureVersion: number;
  machineCode: string;
  machineName: string;
  inspectedOn: string;
  inspectorId: string;
  inspectorName: string;
  employees: { id: string; name: string }[];
  findings: string;
  deviations: string | null;
  deviationEmployees: { id: string; name: string }[];
  certifiedAt: string | null;
  certifiedByName: string | null;
};

export const TRAINING_KINDS = ['authorized', 'affected', 'minor-servicing'] as const;
export type TrainingKind = (typeof TRAINING_KINDS)[number];
export const TRAINING_KIND_LABELS: Record<TrainingKind, string> = {
  authorized: 'Authorized employee (applies locks)',
  affected: 'Affected employee (works near)',
  'minor-servicing': 'Minor servicing task (alternative measures)',
};

export const trainingSchema = z.object({
  userId: z.uuid({ message: 'Choose the person' }),
  procedureId: z.uuid({ message: 'Choose the procedure' }),
  kind: z.enum(TRAINING_KINDS, { message: 'Choose the kind of training' }),
  /** With minor-servicing training: the key of the procedure's minor task. */
  minorTask: z.string().trim().max(40).optional(),
  trainedOn: isoDate('Enter the training date', { refusedIfFuture: true }),
  note: z.string().trim().max(500).optional(),
  password: signPassword,
});
export type TrainingInput = z.infer<typeof trainingSchema>;

export type TrainingStatus = 'current' | 'retrain';
export type TrainingRow = {
  id: string;
  userId: string;
  personName: string;
  procedureId: string;
  procedureTitle: string;
  machineCode: string;
  kind: TrainingKind;
  minorTask: string | null;
  trainedOn: string;
  trainedVersion: number;
  currentVersion: number | null;
  status: TrainingStatus;
  trainerName: string;
};

export const startFireWatchSchema = z.object({
  machineId: z.uuid({ message: 'Choose the machine' }),
  /** When cutting stopped; the watch runs from here. Defaults to now. */
  cuttingEndedAt: isoDateTime('Use a date and time').optional(),
  area: z.string().trim().max(200).optional(),
  password: signPassword,
});
export type StartFireWatchInput = z.infer<typeof startFireWatchSchema>;
export const endFireWatchSchema = z.object({
  noFireFound: z.literal(true, { message: 'Confirm that you found no fire or smouldering material' }),
  note: z.string().trim().max(500).optional(),
  password: signPassword,
});
export type EndFireWatchInput = z.infer<typeof endFireWatchSchema>;

export type FireWatchRow = {
  id: string;
  machineCode: string;
  machineName: string;
  watcherId: string;
  watcherName: string;
  cuttingEndedAt: string;
  until: string;
  rule: string;
  ruleLabel: string;
  ruleSource: string;
  followUp: string | null;
  endedAt: string | null;
  area: string | null;
};

const hhmm = z.string().regex(/^([01]\d|2[0-3]):[0-5]\d$/, 'Use 24-hour time, e.g. 06:00');
export const WEEKDAYS = ['MO', 'TU', 'WE', 'TH', 'FR', 'SA', 'SU'] as const;

export const shadeBandSchema = z.object({
  label: oneLine(z.string().trim().min(1, 'Name the band').max(40)),
  fromA: z.number().min(0),
  toA: z.number().positive(),
  minimum: z.number().int().min(1).max(14),
  suggested: z.number().int().min(1).max(14),
});
export const shadeTableSchema = z.object({
  source: z.string().trim().min(3, 'Name the code or table the shades come from').max(300),
  notes: z.array(z.string().max(500)).max(5).default([]),
  bands: z.array(shadeBandSchema).min(1, 'Add at least one band').max(12),
});

export const safetySettingsSchema = z.object({
  fireWatchRequired: z.boolean(),
  fireWatchRule: z.enum(['osha-1910.252', 'nfpa-51b-2019']),
  /** TWA from which hearing protection is listed as required PPE. */
  hearingRequiredFromDbA: z.number().min(75, 'At least 75 dBA').max(90, 'At most 90 dBA (the OSHA PEL)'),
  hearingRuleSource: z.string().trim().min(3, 'Name the rule').max(200),
  /** null: the OSHA 1910.133(a)(5) table. */
  shadeTable: shadeTableSchema.nullable(),
  shiftStarts: z.array(hhmm).min(1, 'Add at least one shift start').max(4, 'At most 4 shifts'),
  workDays: z.array(z.enum(WEEKDAYS)).min(1, 'Pick at least one work day'),
  /** OSHA 29 CFR 1910.147(c)(6)(i): at least annually. */
  inspectionIntervalMonths: z.number().int().min(1).max(12, 'The periodic inspection is required at least every 12 months (1910.147(c)(6)(i))'),
});
export type SafetySettings = z.infer<typeof safetySettingsSchema>;

export type SafetySettingsView = SafetySettings & {
  defaults: { shadeSource: string; hearingRuleSource: string; fireWatch: { id: string; label: string; source: string; description: string }[] };
};

export const TASK_KINDS = ['ppe-check', 'periodic-inspection', 'retraining'] as const;
export type SafetyTaskKind = (typeof TASK_KINDS)[number];
export const TASK_KIND_LABELS: Record<SafetyTaskKind, string> = {
  'ppe-check': 'PPE check',
  'periodic-inspection': 'Periodic inspection',
  retraining: 'Retraining',
};

export type SafetyTaskRow = {
  id: string;
  kind: SafetyTaskKind;
  title: string;
  machineCode: string | null;
  dueAt: string | null;
  status: 'due' | 'overdue';
  raisedAt: string;
  /** Where the work is done: the PPE check of this machine, the inspection of this procedure, the training of this person. */
  machineId: string | null;
  procedureId: string | null;
  personId: string | null;
  trainingKind: TrainingKind | null;
};

/** Whether a person may apply locks with a procedure, and why not (1910.147(c)(7)(i)(A)). */
export type LockoutAuthorization = {
  authorized: boolean;
  reason: string | null;
  currentVersion: number | null;
  trainedVersion: number | null;
  /** Minor-servicing tasks of the procedure the person is trained for. */
  minorTasks: string[];
};
