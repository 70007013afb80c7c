import { defineEntity, p, type InferEntity } from '@mikro-orm/core';
import { baseProperties, orgFilter } from '../common/base';
import { Organization } from '../organizations/organization.entity';
import { User } from '../users/user.entity';

export const ActivityEvent = defineEntity({
  name: 'ActivityEvent',
  // The table keeps the name it was created with: renaming it would need a migration and gain nothing.
  tableName: 'audit_event',
  filters: orgFilter,
  indexes: [{ properties: ['organization', 'createdAt'] }],
  properties: {
    ...baseProperties,
    organization: () => p.manyToOne(Organization).ref(),
    actor: () => p.manyToOne(User).ref().nullable(),
    action: p.string().length(80),
    entityType: p.string().length(80),
    entityId: p.string().length(80).nullable(),
    details: p.json<Record<string, unknown>>().nullable(),
  },
});
export type IActivityEvent = InferEntity<typeof ActivityEvent>;
