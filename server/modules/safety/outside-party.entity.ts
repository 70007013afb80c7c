import { defineEntity, p, type InferEntity } from '@mikro-orm/core';
import { baseProperties, orgFilter } from '../common/base';
import { Organization } from '../organizations/organization.entity';
import { User } from '../users/user.entity';
import { LockoutSession } from './lockout.entity';

/**
 * An outside employer's crew working under a lockout (OSHA 29 CFR 1910.147(f)(2)): who they are,
 * the procedure they brought, their personal locks, and the signed steps so far. Their locks count
 * as applied from `locksAppliedAt` until `locksRemovedAt`.
 */
export const OutsideParty = defineEntity({
  name: 'OutsideParty',
  tableName: 'safety_outside_party',
  filters: orgFilter,
  properties: {
    ...baseProperties,
    organization: () => p.manyToOne(Organization).ref(),
    session: () => p.manyToOne(LockoutSession).ref(),
    company: p.string().length(120),
    leadName: p.string().length(120),
    leadContact: p.string().length(120),
    procedureTitle: p.string().length(160),
    procedureVersion: p.string().length(30),
    lockNumbers: p.json<string[]>(),
    registeredBy: () => p.manyToOne(User).ref(),
    acknowledgement: p.string().length(500).nullable(),
    restrictions: p.text().nullable(),
    informedWho: p.string().length(500).nullable(),
    locksAppliedAt: p.datetime().nullable(),
    locksRemovedAt: p.datetime().nullable(),
    /** Each signed step: step → sign-off id, signer and time. */
    steps: p.json<Record<string, { signOffId: string; signerId: string; signerName: string; at: string }>>(),
  },
});
export type IOutsideParty = InferEntity<typeof OutsideParty>;
