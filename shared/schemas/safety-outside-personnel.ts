import { z } from 'zod';
import { signPassword } from './safety-sign-offs';
import { oneLine } from './text';

/**
 * Outside personnel (contractors) servicing a locked-out machine, OSHA 29 CFR 1910.147(f)(2):
 * (f)(2)(i) the on-site and the outside employer inform each other of their energy-control
 * procedures; (f)(2)(ii) the on-site employer makes sure its own employees understand and comply
 * with the outside employer's restrictions. The lead's acknowledgement and the locks on/off are our
 * own steps, so that an outside lock is on the record like any other lock.
 */
export const OUTSIDE_STEPS = ['procedures-exchanged', 'lead-acknowledged', 'restrictions-informed', 'locks-applied', 'locks-removed'] as const;
export type OutsideStep = (typeof OUTSIDE_STEPS)[number];

export const OUTSIDE_STEP_LABELS: Record<OutsideStep, { title: string; source: string }> = {
  'procedures-exchanged': { title: 'Procedures exchanged: theirs received and reviewed, ours given', source: '1910.147(f)(2)(i)' },
  'lead-acknowledged': { title: 'Their lead acknowledged our procedure', source: '1910.147(f)(2)(i)' },
  'restrictions-informed': { title: 'Our affected employees told of their restrictions', source: '1910.147(f)(2)(ii)' },
  'locks-applied': { title: 'Their locks on', source: '1910.147(f)(2), (c)(5)(ii)(C)(1)' },
  'locks-removed': { title: 'Their locks off, their people clear', source: '1910.147(e)(3), (f)(2)' },
};

const lockNumber = oneLine(z.string().trim().min(1, 'Enter the lock number').max(30, 'Lock number: at most 30 characters'));
const line = (min: number, what: string, max: number) =>
  oneLine(z.string().trim().min(min, `${what}: at least ${min} characters`).max(max, `${what}: at most ${max} characters`));

/** Step (i): registers the outside party on a lockout. Ticks are checked by the server so a refusal is audited. */
export const registerOutsidePartySchema = z
  .object({
    company: line(2, 'Company', 120),
    leadName: line(2, 'Lead’s name', 120),
    leadContact: line(5, 'Phone or e-mail', 120),
    procedureTitle: line(3, 'Their procedure’s title', 160),
    procedureVersion: line(1, 'Their procedure’s version', 30),
    lockNumbers: z.array(lockNumber).min(1, 'List the personal lock numbers of their people').max(20, 'At most 20 locks'),
    theirProcedureReviewed: z.boolean().default(false),
    ourProcedureGiven: z.boolean().default(false),
    password: signPassword,
  })
  .superRefine((v, ctx) => {
    const seen = new Set<string>();
    v.lockNumbers.forEach((n, i) => {
      const k = n.toUpperCase();
      if (seen.has(k)) ctx.addIssue({ code: 'custom', path: ['lockNumbers', i], message: `Lock ${n} is listed twice` });
      seen.add(k);
    });
  });
export type RegisterOutsidePartyInput = z.infer<typeof registerOutsidePartySchema>;

/** Step (ii): the lead has no account; they say it, the on-site person types it and signs as witness. */
export const acknowledgeOutsideSchema = z.object({
  leadNameTyped: oneLine(z.string().trim().max(120)).default(''),
  acknowledgement: z.string().trim().max(500, 'Acknowledgement: at most 500 characters').default(''),
  password: signPassword,
});
export type AcknowledgeOutsideInput = z.infer<typeof acknowledgeOutsideSchema>;

/** Step (iii): who among our affected employees was told, and of which restrictions. */
export const informOutsideSchema = z.object({
  restrictions: z.string().trim().max(1000, 'Restrictions: at most 1000 characters').default(''),
  informedWho: z.string().trim().max(500, 'At most 500 characters').default(''),
  password: signPassword,
});
export type InformOutsideInput = z.infer<typeof informOutsideSchema>;

export const outsideLocksAppliedSchema = z.object({ password: signPassword });
export type OutsideLocksAppliedInput = z.infer<typeof outsideLocksAppliedSchema>;

export const outsideLocksRemovedSchema = z.object({
  removedByTheirLead: z.boolean().default(false),
  peopleClear: z.boolean().default(false),
  password: signPassword,
});
export type OutsideLocksRemovedInput = z.infer<typeof outsideLocksRemovedSchema>;

export type OutsidePartyRow = {
  id: string;
  lockoutId: string;
  company: string;
  leadName: string;
  leadContact: string;
  procedureTitle: string;
  procedureVersion: string;
  lockNumbers: string[];
  registeredByName: string;
  acknowledgement: string | null;
  restrictions: string | null;
  informedWho: string | null;
  locksOn: boolean;
  steps: { step: OutsideStep; signerName: string; at: string; signOffId: string }[];
  /** Steps still to sign, in the order the panel offers them. */
  open: OutsideStep[];
};
