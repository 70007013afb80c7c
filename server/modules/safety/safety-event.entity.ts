import { randomUUID } from 'node:crypto';
import { defineEntity, p, type InferEntity } from '@mikro-orm/core';
import { orgFilter } from '../common/base';
import { Organization } from '../organizations/organization.entity';
import { User } from '../users/user.entity';
import { Machine } from '../machines/machine.entity';

export const SAFETY_EVENT_KINDS = ['refused', 'alarm'] as const;

/**
 * What the safety audit shows beside the signatures: attempts the product refused (a lock without
 * current training, someone else's lock, one's own draft …) and alarms it raised (a counter that
 * rose while locked out). Nothing here is a signature, so it is not in the hash chain; it is
 * append-only all the same (trigger in the migration, and the app role may not update or delete).
 */
export const SafetyEvent = defineEntity({
  name: 'SafetyEvent',
  tableName: 'safety_event',
  filters: orgFilter,
  uniques: [{ properties: ['organization', 'dedupeKey'] }],
  indexes: [{ properties: ['organization', 'at'] }, { properties: ['machine', 'kind', 'at'] }],
  properties: {
    id: p
      .uuid()
      .primary()
      .onCreate(() => randomUUID()),
    organization: () => p.manyToOne(Organization).ref().deleteRule('no action').updateRule('no action'),
    at: p.datetime(),
    kind: p.enum([...SAFETY_EVENT_KINDS]),
    /** What was attempted or detected, e.g. "lockout.apply", "meter.advance-while-locked". */
    action: p.string().length(60),
    reason: p.text(),
    person: () => p.manyToOne(User).ref().nullable().deleteRule('no action').updateRule('no action'),
    personName: p.string().length(120).nullable(),
    machine: () => p.manyToOne(Machine).ref().nullable().deleteRule('no action').updateRule('no action'),
    subjectId: p.uuid().nullable(),
    details: p.json<Record<string, unknown>>(),
    /** An alarm is raised once per piece of evidence (e.g. meter and reading pair). */
    dedupeKey: p.string().length(200).nullable(),
  },
});
export type ISafetyEvent = InferEntity<typeof SafetyEvent>;
