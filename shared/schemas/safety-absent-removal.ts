import { z } from 'zod';
import { signPassword } from './safety-sign-offs';

/**
 * The steps of removing an absent employee's lock, in the order OSHA 29 CFR 1910.147(e)(3) sets
 * them: (i) verify the employee is not at the facility, (ii) make all reasonable efforts to contact
 * them, our added step of the safety officer's authorization, the removal itself, and (iii) make
 * sure they know before they resume work at the facility.
 */
export const ABSENT_REMOVAL_STEPS = ['absence-verified', 'contact-attempted', 'removal-authorized', 'locks-removed', 'employee-informed'] as const;
export type AbsentRemovalStep = (typeof ABSENT_REMOVAL_STEPS)[number];

export const ABSENT_STEP_LABELS: Record<AbsentRemovalStep, { title: string; source: string; who: 'supervisor' | 'safety' }> = {
  'absence-verified': { title: 'Employee verified not at the facility', source: '1910.147(e)(3)(i)', who: 'supervisor' },
  'contact-attempted': { title: 'Attempt to contact the employee', source: '1910.147(e)(3)(ii)', who: 'supervisor' },
  'removal-authorized': { title: 'Removal authorized by the safety officer', source: '1910.147(e)(3) (the employer’s specific procedure)', who: 'safety' },
  'locks-removed': { title: 'Locks removed, area checked', source: '1910.147(e)(3), (e)(1)-(2)', who: 'supervisor' },
  'employee-informed': { title: 'Employee informed before resuming work', source: '1910.147(e)(3)(iii)', who: 'supervisor' },
};

export const startAbsentRemovalSchema = z.object({
  absentUserId: z.uuid({ message: 'Choose whose lock is to be removed' }),
  /** How absence was checked: badge record, gate log, walk-round … */
  note: z.string().trim().min(5, 'Say how you checked that the employee is not at the facility').max(500),
  notOnSite: z.literal(true, { message: 'Confirm that the employee is not at the facility' }),
  password: signPassword,
});
export type StartAbsentRemovalInput = z.infer<typeof startAbsentRemovalSchema>;

export const absentStepSchema = z.object({
  step: z.enum(['contact-attempted', 'removal-authorized', 'locks-removed', 'employee-informed'], { message: 'Unknown step' }),
  note: z.string().trim().min(5, 'Say what was done (at least 5 characters)').max(500),
  password: signPassword,
});
export type AbsentStepInput = z.infer<typeof absentStepSchema>;

export type AbsentRemovalRow = {
  id: string;
  sessionId: string;
  absentUserId: string;
  absentName: string;
  supervisorName: string;
  step: AbsentRemovalStep;
  nextStep: AbsentRemovalStep | null;
  locks: { key: string; lock: string }[];
  steps: { step: AbsentRemovalStep; signerName: string; at: string; note: string | null; signOffId: string }[];
};
