import { randomUUID } from 'node:crypto';
import { p, type EventArgs, type EventSubscriber } from '@mikro-orm/core';
import { clock } from '../../../shared/clock';

/** Columns every table has. */
export const baseProperties = {
  id: p
    .uuid()
    .primary()
    .onCreate(() => randomUUID()),
  createdAt: p.datetime().onCreate(() => clock.now()),
  updatedAt: p
    .datetime()
    .onCreate(() => clock.now())
    .onUpdate(() => clock.now()),
};

/**
 * Shop isolation in one place: every entity that belongs to an organisation carries this
 * filter. It is on by default and has no default argument, so a query made without the
 * signed-in user's organisation fails loudly instead of reading every shop's rows.
 * System code that must cross shops (the scheduled job) says so with `filters: false`.
 */
export const orgFilter = {
  org: {
    name: 'org',
    cond: (args: { orgId: string }) => ({ organization: args.orgId }),
    default: true,
  },
};

/**
 * Gives new entities their uuid at `em.create` time instead of at flush, so services can
 * link rows and write activity-log records before anything is flushed.
 */
export class AssignIdOnCreate implements EventSubscriber {
  onInit(args: EventArgs<{ id?: string }>) {
    if (args.meta.properties.id && args.entity.id === undefined) args.entity.id = randomUUID();
  }
}
