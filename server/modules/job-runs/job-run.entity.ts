import { defineEntity, p, type InferEntity } from '@mikro-orm/core';
import { baseProperties, orgFilter } from '../common/base';
import { Organization } from '../organizations/organization.entity';
import { User } from '../users/user.entity';

/** What one scheduled pass did for one shop: counts and errors, so admins can see the engine is alive. */
export const JobRun = defineEntity({
  name: 'JobRun',
  tableName: 'job_run',
  filters: orgFilter,
  indexes: [{ properties: ['organization', 'startedAt'] }],
  properties: {
    ...baseProperties,
    organization: () => p.manyToOne(Organization).ref(),
    passId: p.uuid(),
    trigger: p.enum(['schedule', 'manual'] as const),
    triggeredBy: () => p.manyToOne(User).ref().nullable(),
    startedAt: p.datetime(),
    finishedAt: p.datetime().nullable(),
    /** Active plans looked at; only those whose inputs or time boundary changed are evaluated. */
    plansChecked: p.integer().default(0),
    plansEvaluated: p.integer().default(0),
    workOrdersRaised: p.integer().default(0),
    escalations: p.integer().default(0),
    mailsQueued: p.integer().default(0),
    errors: p.json<{ planId?: string; message: string }[]>(),
  },
});
export type IJobRun = InferEntity<typeof JobRun>;
