import { defineEntity, p, type InferEntity } from '@mikro-orm/core';
import { baseProperties, orgFilter } from '../common/base';
import { Organization } from '../organizations/organization.entity';
import { User } from '../users/user.entity';

/** A private iCalendar feed URL; only the SHA-256 of its token is kept. */
export const CalendarFeed = defineEntity({
  name: 'CalendarFeed',
  tableName: 'calendar_feed',
  filters: orgFilter,
  indexes: [{ properties: ['organization', 'user'] }],
  properties: {
    ...baseProperties,
    organization: () => p.manyToOne(Organization).ref(),
    user: () => p.manyToOne(User).ref(),
    tokenHash: p.string().length(64).unique(),
    revokedAt: p.datetime().nullable(),
    lastUsedAt: p.datetime().nullable(),
  },
});
export type ICalendarFeed = InferEntity<typeof CalendarFeed>;
