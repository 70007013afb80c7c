import { defineEntity, p, type InferEntity } from '@mikro-orm/core';
import { baseProperties, orgFilter } from '../common/base';
import { Organization } from '../organizations/organization.entity';
import { User } from '../users/user.entity';
import { LockoutSession } from './lockout.entity';
import { TEST_WINDOW_PURPOSES } from '../../../shared/schemas/safety-testing-window';

/**
 * One temporary removal of lockout devices to test or position the machine (OSHA 29 CFR
 * 1910.147(f)(1)): opened when the devices come off, reapplied when they go back on, closed by
 * the verification that follows. The verified intervals of the lockout end and start here.
 */
export const LockoutTestWindow = defineEntity({
  name: 'LockoutTestWindow',
  tableName: 'safety_lockout_test_window',
  filters: orgFilter,
  indexes: [{ properties: ['session', 'openedAt'] }],
  properties: {
    ...baseProperties,
    organization: () => p.manyToOne(Organization).ref(),
    session: () => p.manyToOne(LockoutSession).ref(),
    purpose: p.enum([...TEST_WINDOW_PURPOSES]),
    reason: p.string().length(300),
    membersClear: p.boolean().default(false),
    /** The lockout points whose devices came off, with their lock numbers then. */
    removed: p.json<{ pointId: string; sourceKey: string; lockNumber: string }[]>(),
    openedAt: p.datetime(),
    openedBy: () => p.manyToOne(User).ref(),
    openSignOffId: p.uuid(),
    reappliedAt: p.datetime().nullable(),
    reapplySignOffId: p.uuid().nullable(),
    reverifiedAt: p.datetime().nullable(),
    reverifySignOffId: p.uuid().nullable(),
  },
});
export type ILockoutTestWindow = InferEntity<typeof LockoutTestWindow>;
