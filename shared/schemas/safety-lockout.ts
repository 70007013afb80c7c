import { z } from 'zod';
import { signPassword } from './safety-sign-offs';
import { paging } from './paging';
import { oneLine } from './text';
import { tagJustificationFields, tagOnlyJustificationIssues, type TagOnlyBasis } from './safety-tag-only';

/** Devices put on an isolation point (OSHA 29 CFR 1910.147(c)(5) lockout and tagout devices). */
export const LOCK_DEVICES = ['lock-and-tag', 'lock', 'tag-only', 'valve-cover', 'plug-cover', 'blocking'] as const;
export type LockDevice = (typeof LOCK_DEVICES)[number];
export const LOCK_DEVICE_LABELS: Record<LockDevice, string> = {
  'lock-and-tag': 'Lock and tag',
  lock: 'Lock',
  'tag-only': 'Tag only',
  'valve-cover': 'Valve cover with lock',
  'plug-cover': 'Plug cover with lock',
  blocking: 'Mechanical block / pin',
};

/** Our names for the states of a lockout. */
export const LOCKOUT_STATES = ['locked', 'verified', 'released', 'testing', 'reapplied'] as const;
export type LockoutState = (typeof LOCKOUT_STATES)[number];
export const LOCKOUT_STATE_LABELS: Record<LockoutState, string> = {
  locked: 'Locked — not yet verified',
  verified: 'Locked and verified',
  released: 'Released',
  // OSHA 29 CFR 1910.147(f)(1): devices off for a test or positioning window, then back on awaiting re-verification.
  testing: 'Energized for testing — locks off',
  reapplied: 'Locks back on — re-verify before work resumes',
};

const lockNumber = oneLine(z.string().trim().min(1, 'Enter the lock number').max(30, 'Lock number: at most 30 characters'));

export const lockPointInput = z.object({
  sourceKey: z.string().trim().min(1).max(8),
  device: z.enum(LOCK_DEVICES, { message: 'Choose the device' }),
  lockNumber: lockNumber,
  tagNumber: oneLine(z.string().trim().max(30, 'Tag number: at most 30 characters')).optional(),
  ...tagJustificationFields,
});

const REASON_MAX = 300;

/** "Work to be done" for a lockout applied from a work order: its number and title, within the field's limit. */
export function lockoutReasonFromWork(wo: { number: number; title: string }): string {
  return `WO ${wo.number}: ${wo.title.trim()}`.slice(0, REASON_MAX);
}

const applyLockoutFields = z.object({
  procedureId: z.uuid({ message: 'Choose the energy-control procedure' }),
  workOrderId: z.uuid({ message: 'Not a valid work order id' }).optional(),
  reason: z.string().trim().min(3, 'Say what work the lockout is for').max(REASON_MAX, `Reason: at most ${REASON_MAX} characters`),
  group: z.boolean().default(false),
  points: z.array(lockPointInput).min(1, 'Lock out at least one isolation point').max(20),
});

function distinctLocks(v: { points: { device: LockDevice; lockNumber: string }[] }, ctx: z.RefinementCtx) {
  const locks = new Map<string, number>();
  v.points.forEach((p, i) => {
    if (p.device !== 'tag-only' && p.device !== 'blocking') {
      const k = p.lockNumber.toUpperCase();
      if (locks.has(k))
        ctx.addIssue({ code: 'custom', path: ['points', i, 'lockNumber'], message: `Lock ${p.lockNumber} is listed twice; each point needs its own lock` });
      locks.set(k, i);
    }
  });
}

/** The form also asks for each tag-only point's reason before the signing dialog opens. */
function tagOnlyJustified(v: z.infer<typeof applyLockoutFields>, ctx: z.RefinementCtx) {
  for (const issue of tagOnlyJustificationIssues(v.points))
    ctx.addIssue({ code: 'custom', path: issue.path.split('.').map((k) => (/^\d+$/.test(k) ? Number(k) : k)), message: issue.message });
}

/** The form (the password is asked for in the signing dialog). */
export const applyLockoutFormSchema = applyLockoutFields.superRefine(distinctLocks).superRefine(tagOnlyJustified);
export const applyLockoutSchema = applyLockoutFields.extend({ password: signPassword }).superRefine(distinctLocks);
export type ApplyLockoutInput = z.infer<typeof applyLockoutSchema>;

/**
 * A zero-energy reading at one isolation point: the value, its unit, the instrument, and the tester
 * proved on a known source before and after (live-dead-live, common practice in NFPA 70E work).
 * The unit and the proving are checked by the server so that a refusal is recorded in the audit.
 */
export const zeroEnergyReadingSchema = z.object({
  pointId: z.uuid({ message: 'Choose the isolation point' }),
  value: z.number({ message: 'Enter the reading' }).finite(),
  unit: z.string().trim().max(12, 'Unit: at most 12 characters').default(''),
  instrument: oneLine(z.string().trim().min(2, 'Name the instrument (type and asset number)').max(80)),
  testerProvedBefore: z.boolean().default(false),
  testerProvedAfter: z.boolean().default(false),
});
export type ZeroEnergyReading = z.infer<typeof zeroEnergyReadingSchema>;

export const verifyLockoutSchema = z.object({
  /** Every point must be tested: the client sends the ids ticked one by one. */
  testedPointIds: z.array(z.uuid()).min(1, 'Tick each isolation point after testing it'),
  readings: z.array(zeroEnergyReadingSchema).max(20).default([]),
  startAttempted: z.literal(true, { message: 'Try to start the machine with its normal controls first (1910.147(d)(6))' }),
  note: z.string().trim().max(500).optional(),
  password: signPassword,
});
export type VerifyLockoutInput = z.infer<typeof verifyLockoutSchema>;

export const joinLockoutSchema = z.object({ lockNumber, password: signPassword });
export type JoinLockoutInput = z.infer<typeof joinLockoutSchema>;
export const leaveLockoutSchema = z.object({ password: signPassword });

export const offerHandoverSchema = z.object({
  toUserId: z.uuid({ message: 'Choose who takes over' }),
  note: z.string().trim().max(500).optional(),
  password: signPassword,
});
export type OfferHandoverInput = z.infer<typeof offerHandoverSchema>;

export const acceptHandoverSchema = z.object({
  locks: z.array(z.object({ pointId: z.uuid(), lockNumber })).min(1, 'Put your own lock on every point'),
  password: signPassword,
});
export type AcceptHandoverInput = z.infer<typeof acceptHandoverSchema>;

const confirmed = (message: string) => z.literal(true, { message });
/** OSHA 29 CFR 1910.147(e)(1)-(3): what must be true before the devices come off. */
export const releaseLockoutSchema = z.object({
  areaChecked: confirmed('Check the work area: tools removed, guards back, machine intact'),
  peopleClear: confirmed('Make sure everyone is clear of the machine'),
  affectedNotified: confirmed('Tell the affected employees that the devices are coming off'),
  note: z.string().trim().max(500).optional(),
  password: signPassword,
});
export type ReleaseLockoutInput = z.infer<typeof releaseLockoutSchema>;

export const listLockoutsQuery = paging.extend({
  state: z.enum(['open', ...LOCKOUT_STATES]).optional(),
  machineId: z.uuid().optional(),
});
export type ListLockoutsQuery = z.infer<typeof listLockoutsQuery>;

export type LockPointRow = {
  id: string;
  sourceKey: string;
  sourceKind: string;
  isolationDevice: string;
  location: string;
  device: LockDevice;
  lockNumber: string;
  tagNumber: string | null;
  /** Why a tag is used alone (tag-only points signed since the reason was asked). */
  tagJustification: TagOnlyBasis | null;
  tagMeasure: string | null;
  holderId: string;
  holderName: string;
  appliedByName: string;
  appliedAt: string;
  removedAt: string | null;
  removedByName: string | null;
};

export type LockoutRow = {
  id: string;
  state: LockoutState;
  machineId: string;
  machineCode: string;
  machineName: string;
  reason: string;
  group: boolean;
  primaryId: string;
  primaryName: string;
  procedureVersion: number;
  workOrderId: string | null;
  appliedAt: string;
  verifiedAt: string | null;
  releasedAt: string | null;
  activeMembers: number;
};

export type LockoutDetail = LockoutRow & {
  procedureId: string;
  pendingHandoverToId: string | null;
  pendingHandoverToName: string | null;
  points: LockPointRow[];
  members: { id: string; userId: string; name: string; lockNumber: string; joinedAt: string; leftAt: string | null }[];
  signOffs: { id: string; seq: number; signedAt: string; signerName: string; meaning: string; statement: string }[];
};

export const lockRegisterQuery = paging.extend({
  /** Part of a lock number or a holder's name. */
  q: z.string().trim().max(60).optional(),
  status: z.enum(['all', 'applied', 'free']).default('all'),
});
export type LockRegisterQuery = z.infer<typeof lockRegisterQuery>;

/** One use of a lock: on an isolation point of a lockout, or as a personal lock on a group lockout. */
export type LockUse = {
  lockoutId: string;
  machineCode: string;
  where: string;
  personal: boolean;
  holderName: string;
  appliedAt: string;
  removedAt: string | null;
  removedByName: string | null;
};

/** A lock by its number: who holds it, where it is applied now, and where it has been. */
export type LockRegisterRow = {
  lockNumber: string;
  holderName: string;
  current: LockUse | null;
  uses: number;
  history: LockUse[];
};
