import { z } from 'zod';
import { paging } from './paging';
import { isoDate } from './text';

/**
 * What a safety signature means. Every record in the safety log is one of these; the
 * statement is printed beside the signer's name on screens, exports and the placard.
 */
export const SIGN_MEANINGS = [
  'procedure-approved',
  'lockout-applied',
  'isolation-verified',
  'member-joined',
  'member-left',
  'handover-offered',
  'handover-accepted',
  'lockout-released',
  'ppe-check-done',
  'inspection-performed',
  'inspection-certified',
  'training-recorded',
  'fire-watch-started',
  'fire-watch-ended',
  'correction',
  'safety-work-signed-off',
  'deviation-accepted',
  'absence-verified',
  'contact-attempted',
  'removal-authorized',
  'absent-locks-removed',
  'employee-informed',
  'pre-use-check-done',
  'testing-window-opened',
  'energy-control-reapplied',
  'isolation-reverified',
  'outside-procedures-exchanged',
  'outside-procedure-acknowledged',
  'outside-restrictions-informed',
  'outside-locks-applied',
  'outside-locks-removed',
] as const;
export type SignMeaning = (typeof SIGN_MEANINGS)[number];

/** Short label for tables and filters. */
export const MEANING_LABELS: Record<SignMeaning, string> = {
  'procedure-approved': 'Procedure approved',
  'lockout-applied': 'Locks applied',
  'isolation-verified': 'Zero energy verified',
  'member-joined': 'Joined group lockout',
  'member-left': 'Left group lockout',
  'handover-offered': 'Hand-over offered',
  'handover-accepted': 'Hand-over accepted',
  'lockout-released': 'Lockout released',
  'ppe-check-done': 'PPE check done',
  'inspection-performed': 'Inspection performed',
  'inspection-certified': 'Inspection certified',
  'training-recorded': 'Training recorded',
  'fire-watch-started': 'Fire watch started',
  'fire-watch-ended': 'Fire watch ended',
  correction: 'Correction',
  'safety-work-signed-off': 'Safety work signed off',
  'deviation-accepted': 'Failed check: deviation accepted',
  'absence-verified': 'Absent employee: not at facility',
  'contact-attempted': 'Absent employee: contact attempted',
  'removal-authorized': 'Absent employee: removal authorized',
  'absent-locks-removed': 'Absent employee: locks removed',
  'employee-informed': 'Absent employee: informed',
  'pre-use-check-done': 'Pre-use check done',
  'testing-window-opened': 'Locks off for testing or positioning',
  'energy-control-reapplied': 'Locks back on after testing',
  'isolation-reverified': 'Zero energy verified again after testing',
  'outside-procedures-exchanged': 'Outside personnel: procedures exchanged',
  'outside-procedure-acknowledged': 'Outside personnel: our procedure acknowledged',
  'outside-restrictions-informed': 'Outside personnel: our employees informed',
  'outside-locks-applied': 'Outside personnel: their locks on',
  'outside-locks-removed': 'Outside personnel: their locks off',
};

/** The sentence the signer agrees to by re-entering their password. */
export const MEANING_STATEMENTS: Record<SignMeaning, string> = {
  'procedure-approved': 'I approve this version of the energy-control procedure for use on this machine.',
  'lockout-applied': 'I applied my own lockout or tagout devices at the isolation points listed. Where a tag is used alone, the reason given beside it holds.',
  'isolation-verified': 'I tried to start the machine and tested each isolation point; no hazardous energy remains.',
  'member-joined': 'I put my personal lock on this group lockout before starting work.',
  'member-left': 'I finished my work and removed my personal lock from this group lockout.',
  'handover-offered': 'I hand over this lockout; my devices stay on until the oncoming person’s devices are on.',
  'handover-accepted': 'I take over this lockout; my devices are on and the off-going devices are off.',
  'lockout-released': 'I checked the work area, everyone is clear, affected employees are told, and I removed my devices.',
  'ppe-check-done': 'I am wearing every item of PPE this task requires, in good condition.',
  'inspection-performed': 'I inspected this procedure in use and reviewed each employee’s responsibilities with them.',
  'inspection-certified': 'I certify that this periodic inspection was performed as recorded.',
  'training-recorded': 'I trained this person on this procedure and they showed they understand it.',
  'fire-watch-started': 'I am keeping fire watch over the area where hot work ended.',
  'fire-watch-ended': 'I kept fire watch for the full time and found no fire or smouldering material.',
  correction: 'I correct an earlier safety record as described in the note.',
  'safety-work-signed-off': 'I did this safety work as its checklist records, and the machine is fit to run.',
  'deviation-accepted': 'I accept that the machine runs with this failed safety check, for the reason and under the measures I give.',
  'absence-verified': 'I verified that the employee who applied these locks is not at the facility.',
  'contact-attempted': 'I made every reasonable effort to tell the employee that their locks are to be removed, as described.',
  'removal-authorized': 'As safety officer I authorize removal of the absent employee’s locks by the supervisor named.',
  'absent-locks-removed': 'I checked the work area and that everyone is clear, then removed the absent employee’s locks listed.',
  'employee-informed': 'I told the employee that their locks were removed, before they resumed work at the facility.',
  'pre-use-check-done': 'I checked each line of this machine’s pre-use check myself and recorded what I found.',
  'testing-window-opened':
    'The machine is cleared of tools and materials, everyone is out of the machine area, and I removed the devices listed to test or position the machine as described.',
  'energy-control-reapplied': 'I de-energized the machine and put my lockout or tagout devices back on every isolation point listed.',
  'isolation-reverified': 'After testing or positioning I tried to start the machine and tested each isolation point again; no hazardous energy remains.',
  'outside-procedures-exchanged': 'I received and reviewed the outside employer’s energy-control procedure named here, and gave them ours.',
  'outside-procedure-acknowledged': 'I witnessed the outside lead named here acknowledge our energy-control procedure in the words recorded.',
  'outside-restrictions-informed': 'I told our affected employees named here of the outside employer’s restrictions and that they must comply with them.',
  'outside-locks-applied': 'I witnessed the outside personnel put on the locks listed, after their lead acknowledged our procedure.',
  'outside-locks-removed': 'I witnessed the outside lead remove their own locks listed and checked that their people are clear.',
};

/** The password re-entered at signing (21 CFR 11.200-style re-authentication, house rule). */
export const signPassword = z.string({ message: 'Enter your password to sign' }).min(1, 'Enter your password to sign').max(200, 'Password is too long');

const listSignOffsObject = paging.extend({
  machineId: z.uuid({ message: 'Not a valid machine id' }).optional(),
  signerId: z.uuid({ message: 'Not a valid person id' }).optional(),
  meaning: z.enum(SIGN_MEANINGS, { message: 'Unknown meaning' }).optional(),
  from: isoDate('Use a date like 2026-03-01').optional(),
  to: isoDate('Use a date like 2026-03-31').optional(),
  sort: z.enum(['signedAt', 'signerName', 'meaning', 'machine', 'seq']).default('signedAt'),
  dir: z.enum(['asc', 'desc']).default('desc'),
});

/** The message for a "To" date before the "From" date; the audit screen shows the same words. */
export const reversedRangeMessage = (from: string) => `"To" must be on or after "From" (${from})`;

/** A reversed range is a mistake, not an empty result: say so on the "To" field. */
function rangeInOrder(q: { from?: string; to?: string }, ctx: z.RefinementCtx) {
  if (q.from && q.to && q.to < q.from) ctx.addIssue({ code: 'custom', path: ['to'], message: reversedRangeMessage(q.from) });
}

export const listSignOffsQuery = listSignOffsObject.superRefine(rangeInOrder);
export type ListSignOffsQuery = z.infer<typeof listSignOffsQuery>;
/** The same filters without paging, for the CSV and PDF exports. */
export const exportSignOffsQuery = listSignOffsObject.omit({ page: true, pageSize: true }).superRefine(rangeInOrder);
export type ExportSignOffsQuery = z.infer<typeof exportSignOffsQuery>;

export const correctionSchema = z.object({
  note: z.string().trim().min(5, 'Say what was wrong and what is right (at least 5 characters)').max(1000, 'Keep the note under 1000 characters'),
  password: signPassword,
});
export type CorrectionInput = z.infer<typeof correctionSchema>;

export type SignOffRow = {
  id: string;
  seq: number;
  signedAt: string;
  signerId: string;
  signerName: string;
  signerRole: string;
  meaning: SignMeaning;
  statement: string;
  subjectType: string;
  subjectId: string;
  machineId: string | null;
  machineCode: string | null;
  machineName: string | null;
  summary: string;
  note: string | null;
  correctsId: string | null;
  correctsSeq: number | null;
  correctedBy: number[];
  hash: string;
};

export type ChainVerification = {
  ok: boolean;
  /** Records that verified before the first bad one (all when ok). */
  checked: number;
  total: number;
  headSeq: number;
  verifiedAt: string;
  problem: null | 'content-altered' | 'link-broken' | 'head-mismatch' | 'copy-mismatch';
  message: string;
  /** The newest copy of the head that left the database (mail or download), when the chain still holds it. */
  lastCopy?: { seq: number; hash: string; madeAt: string; via: string } | null;
  firstBad: null | { id: string | null; seq: number; signedAt: string | null; signerName: string | null; meaning: SignMeaning | null };
};

/** A signed copy of the chain head, as mailed to the safety officers or downloaded from the safety audit. */
export const chainHeadCopySchema = z.object({
  format: z.literal('kerfbook-chain-head/1', { message: 'Not a Kerfbook chain-head copy' }),
  shopId: z.uuid({ message: 'Not a Kerfbook chain-head copy (shop id)' }),
  shopName: z.string().max(200),
  seq: z.number().int().min(1),
  hash: z.string().regex(/^[0-9a-f]{64}$/, 'The hash must be 64 hexadecimal characters'),
  madeAt: z.string().max(40),
  via: z.enum(['mail', 'export']),
  signature: z.string().regex(/^[0-9a-f]{64}$/, 'The signature must be 64 hexadecimal characters'),
});
export type ChainHeadCopy = z.infer<typeof chainHeadCopySchema>;
export type ChainCopyCheck = { signatureValid: boolean; matches: boolean; message: string };
