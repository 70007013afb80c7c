import { defineEntity, p, type InferEntity } from '@mikro-orm/core';
import { baseProperties, orgFilter } from '../common/base';
import { Organization } from '../organizations/organization.entity';
import { User } from '../users/user.entity';
import { LockoutSession } from './lockout.entity';
import { ABSENT_REMOVAL_STEPS } from '../../../shared/schemas/safety-absent-removal';

/**
 * Removal of an absent employee's locks, OSHA 29 CFR 1910.147(e)(3): each step is its own signed
 * record (absence verified, contact attempted, removal authorized by the safety officer, locks
 * removed, employee informed before resuming work); this row tracks which step comes next.
 */
export const AbsentLockRemoval = defineEntity({
  name: 'AbsentLockRemoval',
  tableName: 'safety_absent_removal',
  filters: orgFilter,
  properties: {
    ...baseProperties,
    organization: () => p.manyToOne(Organization).ref(),
    session: () => p.manyToOne(LockoutSession).ref(),
    absentUser: () => p.manyToOne(User).ref(),
    supervisor: () => p.manyToOne(User).ref(),
    /** The last step signed; the next one is the one after it in ABSENT_REMOVAL_STEPS. */
    step: p.enum([...ABSENT_REMOVAL_STEPS]),
    /** Each signed step: meaning → sign-off id, signer and time. */
    steps: p.json<Record<string, { signOffId: string; signerId: string; signerName: string; at: string; note: string | null }>>(),
    locks: p.json<{ key: string; lock: string }[]>(),
  },
});
export type IAbsentLockRemoval = InferEntity<typeof AbsentLockRemoval>;
