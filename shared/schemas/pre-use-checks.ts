import { z } from 'zod';
import { signPassword } from './safety-sign-offs';
import type { MachineStatus } from './machine-state';
import type { PreUseLine, PreUseVerdict } from '../domain/pre-use-checks';

/** One answered line: OK / Not OK, and the number for a reading line. */
export const preUseAnswerSchema = z.object({
  code: z.string({ message: 'Name the line' }).trim().min(1, 'Name the line').max(40, 'Line code: at most 40 characters'),
  ok: z.boolean({ message: 'Tap OK or Not OK' }),
  value: z
    .number({ message: 'Enter the reading as a number' })
    .refine(Number.isFinite, 'The reading must be a finite number')
    .min(0, 'A reading cannot be negative')
    .max(100_000, 'The reading looks wrong (above 100000)')
    .nullish()
    .transform((v) => v ?? null),
});

export const preUseCheckSchema = z.object({
  answers: z.array(preUseAnswerSchema, { message: 'Answer every line' }).min(1, 'Answer every line').max(30, 'Too many answers'),
  password: signPassword,
});
export type PreUseCheckInput = z.output<typeof preUseCheckSchema>;

export type PreUseCheckRow = {
  id: string;
  machineCode: string;
  checkedAt: string;
  checkedBy: string;
  pass: boolean;
  safetyCriticalFailed: boolean;
  lines: PreUseVerdict[];
  signOffId: string;
  workOrderId: string | null;
  workOrderNumber: number | null;
};

/** What the check screen needs: the lines, the latest checks, and whether today's is still to do. */
export type PreUseCheckView = {
  machineCode: string;
  machineName: string;
  lines: PreUseLine[] | null;
  /** In service with a list and not yet checked since the shop's day began. */
  dueToday: boolean;
  /** A check was signed since the shop's day began. */
  checkedToday: boolean;
  status: MachineStatus;
  history: PreUseCheckRow[];
};

/** The answer to a signed check: the record and the machine's state after it. */
export type PreUseCheckResult = PreUseCheckRow & { status: MachineStatus };
