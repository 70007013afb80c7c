import { z } from 'zod';
import { isOneLineText, ONE_LINE_MESSAGE } from './text';
import { failureCodeValue } from './machine-state';

/**
 * Three lists, laid out the way ISO 14224 lays out failure data: what was observed (failure
 * mode), why it happened (failure cause) and what was done about it (maintenance action). The
 * codes and names below are Kerfbook's own starting lists; each shop edits its copy.
 */
export const FAILURE_CODE_CATEGORIES = ['mode', 'cause', 'remedy'] as const;
export type FailureCodeCategory = (typeof FAILURE_CODE_CATEGORIES)[number];
export const FAILURE_CODE_CATEGORY_LABELS: Record<FailureCodeCategory, string> = {
  mode: 'Failure mode (what was seen)',
  cause: 'Cause (why)',
  remedy: 'Remedy (what was done)',
};

export const STARTER_FAILURE_CODES: Record<FailureCodeCategory, { code: string; label: string }[]> = {
  mode: [
    { code: 'NOSTART', label: 'Will not start' },
    { code: 'STOPS', label: 'Stops while running' },
    { code: 'LEAK', label: 'Leaks oil, air or coolant' },
    { code: 'NOISE', label: 'Unusual noise or shaking' },
    { code: 'CUTQ', label: 'Poor cut or punch quality' },
    { code: 'POSN', label: 'Wrong position or size' },
    { code: 'GUARD', label: 'Guard or safety device fault' },
    { code: 'CTRL', label: 'Control or display fault' },
    { code: 'OTHER', label: 'Something else' },
  ],
  cause: [
    { code: 'WORN', label: 'Worn out' },
    { code: 'DIRT', label: 'Dirt, slag or contamination' },
    { code: 'LOOSE', label: 'Loose or out of line' },
    { code: 'ELEC', label: 'Electrical part failed' },
    { code: 'HYDR', label: 'Hydraulic part failed' },
    { code: 'SETUP', label: 'Wrong setup or program' },
    { code: 'HANDL', label: 'Handling or operating slip' },
    { code: 'UNKN', label: 'Cause not found' },
  ],
  remedy: [
    { code: 'SWAP', label: 'Part replaced' },
    { code: 'ALIGN', label: 'Adjusted or aligned' },
    { code: 'FIX', label: 'Repaired in place' },
    { code: 'CLEAN', label: 'Cleaned' },
    { code: 'RESET', label: 'Reset or restarted' },
    { code: 'CHANGE', label: 'Changed or improved the design' },
    { code: 'NFF', label: 'Checked, no fault found' },
  ],
};

export type FailureCodeRow = { id: string; category: FailureCodeCategory; code: string; label: string; active: boolean };

const label = z
  .string({ message: 'Enter a name' })
  .trim()
  .min(2, 'Enter a name')
  .max(120, 'Keep the name under 120 characters')
  .refine(isOneLineText, ONE_LINE_MESSAGE);

export const failureCodeInputSchema = z.object({
  category: z.enum(FAILURE_CODE_CATEGORIES, { message: 'Choose failure mode, cause or remedy' }),
  code: failureCodeValue,
  label,
});
export type FailureCodeInput = z.output<typeof failureCodeInputSchema>;

export const failureCodeUpdateSchema = z
  .object({ label: label.optional(), active: z.boolean().optional() })
  .refine((v) => v.label !== undefined || v.active !== undefined, { message: 'Nothing to change' });
export type FailureCodeUpdate = z.output<typeof failureCodeUpdateSchema>;

/** Codes set on a downtime interval once its cause is known (null clears one). */
export const downtimeCodesSchema = z
  .object({
    failureCode: failureCodeValue.nullable().optional(),
    causeCode: failureCodeValue.nullable().optional(),
    remedyCode: failureCodeValue.nullable().optional(),
  })
  .refine((v) => Object.values(v).some((x) => x !== undefined), { message: 'Nothing to change' });
export type DowntimeCodesInput = z.output<typeof downtimeCodesSchema>;
