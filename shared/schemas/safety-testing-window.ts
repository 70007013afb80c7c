/**
 * Temporary removal of lockout devices to test or position a machine, OSHA 29 CFR 1910.147(f)(1):
 * (i) clear the machine of tools and materials, (ii) remove employees from the machine area,
 * (iii) remove the devices per (e), (iv) energize and test or position, (v) de-energize and
 * reapply energy control. Each signed step has its own body here.
 */
import { z } from 'zod';
import { signPassword } from './safety-sign-offs';
import { zeroEnergyReadingSchema } from './safety-lockout';
import { oneLine } from './text';

export const TEST_WINDOW_PURPOSES = ['testing', 'positioning'] as const;
export type TestWindowPurpose = (typeof TEST_WINDOW_PURPOSES)[number];
export const TEST_WINDOW_PURPOSE_LABELS: Record<TestWindowPurpose, string> = {
  testing: 'Test the machine or a component',
  positioning: 'Position the machine or a component',
};

/** A confirmation box; false is refused by the server (not here) so that the refusal lands in the safety audit. */
const confirmation = z.boolean().default(false);

export const openTestWindowSchema = z.object({
  purpose: z.enum(TEST_WINDOW_PURPOSES, { message: 'Choose testing or positioning' }),
  reason: z.string().trim().min(5, 'Say what you test or position (at least 5 characters)').max(300, 'Reason: at most 300 characters'),
  /** (f)(1)(i) */
  machineCleared: confirmation,
  /** (f)(1)(ii) */
  employeesRemoved: confirmation,
  /** Group lockout only: every member still holding a personal lock is out of the machine area. */
  membersClear: z.boolean().default(false),
  /** (f)(1)(iii): which devices come off, by lockout point id. */
  removePointIds: z
    .array(z.uuid({ message: 'Not a valid isolation point id' }))
    .min(1, 'Choose which devices come off')
    .max(20),
  password: signPassword,
});
export type OpenTestWindowInput = z.infer<typeof openTestWindowSchema>;

const lockNumber = oneLine(z.string().trim().min(1, 'Enter the lock number').max(30, 'Lock number: at most 30 characters'));

/** (f)(1)(v): a device back on every point that came off, same device kind, with its lock number. */
export const reapplyAfterTestSchema = z.object({
  locks: z
    .array(
      z.object({
        pointId: z.uuid({ message: 'Choose the isolation point' }),
        lockNumber,
        tagNumber: oneLine(z.string().trim().max(30, 'Tag number: at most 30 characters')).optional(),
      }),
    )
    .min(1, 'Put a lock back on every point that came off')
    .max(20),
  deEnergized: confirmation,
  password: signPassword,
});
export type ReapplyAfterTestInput = z.infer<typeof reapplyAfterTestSchema>;

/** Verification again, as before work first started (1910.147(d)(6)). */
export const reverifyAfterTestSchema = z.object({
  testedPointIds: z.array(z.uuid()).min(1, 'Tick each isolation point after testing it'),
  readings: z.array(zeroEnergyReadingSchema).max(20).default([]),
  startAttempted: z.literal(true, { message: 'Try to start the machine with its normal controls first (1910.147(d)(6))' }),
  note: z.string().trim().max(500).optional(),
  password: signPassword,
});
export type ReverifyAfterTestInput = z.infer<typeof reverifyAfterTestSchema>;

export type TestWindowRow = {
  id: string;
  purpose: TestWindowPurpose;
  reason: string;
  openedAt: string;
  openedByName: string;
  membersClear: boolean;
  removed: { pointId: string; sourceKey: string; lockNumber: string }[];
  reappliedAt: string | null;
  reverifiedAt: string | null;
};
