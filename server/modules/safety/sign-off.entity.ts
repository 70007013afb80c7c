import { randomUUID } from 'node:crypto';
import { defineEntity, p, type InferEntity } from '@mikro-orm/core';
import { orgFilter } from '../common/base';
import { Organization } from '../organizations/organization.entity';
import { User } from '../users/user.entity';
import { Machine } from '../machines/machine.entity';
import { SIGN_MEANINGS } from '../../../shared/schemas/safety-sign-offs';

/**
 * One safety signature. Append-only: a database trigger (see the migration) refuses UPDATE,
 * DELETE and TRUNCATE, and each row is hash-chained to the shop's previous one. So there is
 * no updatedAt, and foreign keys never cascade or null out into this table.
 */
export const SafetySignOff = defineEntity({
  name: 'SafetySignOff',
  tableName: 'safety_sign_off',
  filters: orgFilter,
  uniques: [{ properties: ['organization', 'seq'] }, { properties: ['organization', 'prevHash'] }],
  indexes: [{ properties: ['organization', 'signedAt'] }, { properties: ['subjectId'] }],
  properties: {
    id: p
      .uuid()
      .primary()
      .onCreate(() => randomUUID()),
    organization: () => p.manyToOne(Organization).ref().deleteRule('no action').updateRule('no action'),
    /** Position in the shop's chain, 1, 2, 3 … */
    seq: p.integer(),
    /** The server's clock at signing. */
    signedAt: p.datetime(),
    signer: () => p.manyToOne(User).ref().deleteRule('no action').updateRule('no action'),
    /** Printed name and role as they were at signing; a later rename does not change the record. */
    signerName: p.string().length(120),
    signerRole: p.string().length(20),
    meaning: p.enum([...SIGN_MEANINGS]),
    statement: p.text(),
    subjectType: p.string().length(40),
    subjectId: p.uuid(),
    machine: () => p.manyToOne(Machine).ref().nullable().deleteRule('no action').updateRule('no action'),
    /** What was signed for (points, items, people …), as the signer saw it. */
    details: p.json<Record<string, unknown>>(),
    corrects: () => p.manyToOne(SafetySignOff).ref().nullable().deleteRule('no action').updateRule('no action'),
    note: p.string().length(1000).nullable(),
    prevHash: p.string().length(64),
    hash: p.string().length(64).unique(),
  },
});
export type ISafetySignOff = InferEntity<typeof SafetySignOff>;

/**
 * The newest link of each shop's chain. Sign-offs lock this row (SELECT … FOR UPDATE) so
 * concurrent signatures queue up instead of forking the chain, and verification compares it
 * with the last stored record so that removing the newest records shows.
 */
export const SafetyChainHead = defineEntity({
  name: 'SafetyChainHead',
  tableName: 'safety_chain_head',
  filters: orgFilter,
  properties: {
    id: p
      .uuid()
      .primary()
      .onCreate(() => randomUUID()),
    organization: () => p.manyToOne(Organization).ref().unique(),
    lastSeq: p.integer().default(0),
    lastHash: p.string().length(64),
    updatedAt: p.datetime(),
  },
});
export type ISafetyChainHead = InferEntity<typeof SafetyChainHead>;

/**
 * Each time the chain head left the database (the daily mail to the safety officers, or a
 * download from the safety audit page): the sequence number and hash it carried, and the
 * HMAC it was signed with. Verification checks the chain still holds that hash at that
 * number, so history rewritten below a copy shows even when the rewrite is self-consistent.
 * Append-only for the app role, like the sign-offs.
 */
export const SafetyChainCopy = defineEntity({
  name: 'SafetyChainCopy',
  tableName: 'safety_chain_copy',
  filters: orgFilter,
  indexes: [{ properties: ['organization', 'madeAt'] }],
  properties: {
    id: p
      .uuid()
      .primary()
      .onCreate(() => randomUUID()),
    organization: () => p.manyToOne(Organization).ref().deleteRule('no action').updateRule('no action'),
    seq: p.integer(),
    hash: p.string().length(64),
    madeAt: p.datetime(),
    via: p.enum(['mail', 'export'] as const),
    /** Who downloaded it (an export), or null (the daily mail). */
    madeBy: () => p.manyToOne(User).ref().nullable().deleteRule('no action').updateRule('no action'),
    /** The shop's local date of a daily mail, so each day sends one. */
    localDate: p.string().length(10).nullable(),
    signature: p.string().length(64),
  },
});
export type ISafetyChainCopy = InferEntity<typeof SafetyChainCopy>;
