import { z } from 'zod';
import { ANY_TEXT_MESSAGE, isOneLineText, isStorableText, ONE_LINE_MESSAGE } from './text';

/** What a machine may be used for right now. Locked out comes from an applied energy-control lockout. */
export const MACHINE_STATES = ['in-service', 'out-of-service', 'locked-out'] as const;
export type MachineState = (typeof MACHINE_STATES)[number];
export const MACHINE_STATE_LABELS: Record<MachineState, string> = {
  'in-service': 'In service',
  'out-of-service': 'Out of service',
  'locked-out': 'Locked out',
};

/** Why a machine stood still: a failure (unplanned) or planned work. */
export const DOWNTIME_KINDS = ['failure', 'planned'] as const;
export type DowntimeKind = (typeof DOWNTIME_KINDS)[number];
export const DOWNTIME_KIND_LABELS: Record<DowntimeKind, string> = { failure: 'Failure', planned: 'Planned stop' };

export type MachineStatus = { state: MachineState; since: string | null; reason: string | null };

/** A failure, cause or remedy code as the shop keeps them: short, upper case, no spaces. */
export const failureCodeValue = z
  .string()
  .trim()
  .min(1, 'Choose a code')
  .max(12, 'A code has at most 12 characters')
  .regex(/^[A-Za-z0-9-]+$/, 'Use letters, digits or dash')
  .transform((v) => v.toUpperCase());

const reasonText = z
  .string({ message: 'Say why' })
  .trim()
  .min(3, 'Say why in a few words')
  .max(500, 'Keep it under 500 characters')
  .refine(isOneLineText, ONE_LINE_MESSAGE);

export const takeOutOfServiceSchema = z.object({
  reason: reasonText,
  kind: z.enum(DOWNTIME_KINDS, { message: 'Choose failure or planned stop' }),
  failureCode: failureCodeValue.nullish().transform((v) => v ?? null),
});
export type TakeOutOfServiceInput = z.output<typeof takeOutOfServiceSchema>;

export const returnToServiceSchema = z.object({
  note: z
    .string()
    .trim()
    .max(500, 'Keep it under 500 characters')
    .nullish()
    .transform((v) => v || null),
});
export type ReturnToServiceInput = z.output<typeof returnToServiceSchema>;

/** A fault reported at the machine: what is wrong, and whether it must stop now. */
export const faultReportSchema = z.object({
  description: z
    .string({ message: 'Describe the fault' })
    .trim()
    .min(3, 'Describe the fault in a few words')
    .max(2000, 'Keep it under 2000 characters')
    .refine(isStorableText, ANY_TEXT_MESSAGE),
  takeOutOfService: z.boolean({ message: 'Say whether the machine must stop' }),
  failureCode: failureCodeValue.nullish().transform((v) => v ?? null),
});
export type FaultReportInput = z.output<typeof faultReportSchema>;
export type FaultReportResult = { workOrderId: string; workOrderNumber: number; status: MachineStatus };

/** One downtime interval as lists and the reliability page read it. */
export type DowntimeRow = {
  id: string;
  machineId: string;
  machineCode: string;
  kind: DowntimeKind;
  reason: string;
  failureCode: string | null;
  causeCode: string | null;
  remedyCode: string | null;
  workOrderId: string | null;
  startedAt: string;
  startedBy: string | null;
  endedAt: string | null;
  endedBy: string | null;
};
