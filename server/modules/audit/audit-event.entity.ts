import { defineEntity, p, type InferEntity } from '@mikro-orm/core';
import { baseProperties, orgFilter } from '../common/base';
import { Organization } from '../organizations/organization.entity';
import { User } from '../users/user.entity';

export const AuditEvent = defineEntity({
  name: 'AuditEvent',
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
export type IAuditEvent = InferEntity<typeof AuditEvent>;
