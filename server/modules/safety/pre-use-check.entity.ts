import { defineEntity, p, type InferEntity } from '@mikro-orm/core';
import { baseProperties, orgFilter } from '../common/base';
import { Organization } from '../organizations/organization.entity';
import { User } from '../users/user.entity';
import { Machine } from '../machines/machine.entity';
import { SafetySignOff } from './sign-off.entity';
import type { PreUseVerdict } from '../../../shared/domain/pre-use-checks';

/**
 * One signed pre-use check of a machine at the start of a shift: every line's answer as judged,
 * the signature, and the repair it raised when a line failed. Append-only (server/db-roles.ts).
 */
export const PreUseCheck = defineEntity({
  name: 'PreUseCheck',
  tableName: 'machine_pre_use_check',
  filters: orgFilter,
  indexes: [{ properties: ['machine', 'checkedAt'] }],
  properties: {
    ...baseProperties,
    organization: () => p.manyToOne(Organization).ref(),
    machine: () => p.manyToOne(Machine).ref().deleteRule('no action'),
    person: () => p.manyToOne(User).ref(),
    checkedAt: p.datetime(),
    lines: p.json<PreUseVerdict[]>(),
    pass: p.boolean(),
    safetyCriticalFailed: p.boolean(),
    signOff: () => p.manyToOne(SafetySignOff).ref().deleteRule('no action'),
    /** The repair raised for the failed lines, if any. */
    workOrderId: p.uuid().nullable(),
    workOrderNumber: p.integer().nullable(),
  },
});
export type IPreUseCheck = InferEntity<typeof PreUseCheck>;
