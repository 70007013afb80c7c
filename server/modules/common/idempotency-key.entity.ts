import { randomUUID } from 'node:crypto';
import { defineEntity, p, type InferEntity } from '@mikro-orm/core';
import { orgFilter } from './base';
import { Organization } from '../organizations/organization.entity';
import { User } from '../users/user.entity';

/**
 * One `Idempotency-Key` a person sent with a write (server/http/idempotency.ts): the request's
 * fingerprint and, once answered, the answer, so a retry gets that answer instead of writing
 * again. A row without `statusCode` is a request still running (or one cut off mid-way).
 */
export const IdempotencyKey = defineEntity({
  name: 'IdempotencyKey',
  tableName: 'idempotency_key',
  filters: orgFilter,
  uniques: [{ properties: ['organization', 'user', 'key'] }],
  indexes: [{ properties: ['expiresAt'] }],
  properties: {
    id: p
      .uuid()
      .primary()
      .onCreate(() => randomUUID()),
    organization: () => p.manyToOne(Organization).ref().deleteRule('cascade'),
    user: () => p.manyToOne(User).ref().deleteRule('cascade'),
    key: p.string().length(200),
    /** `POST /api/…` as called. */
    endpoint: p.string().length(300),
    /** SHA-256 of the request's body (password left out) and file. */
    requestHash: p.string().length(64),
    statusCode: p.integer().nullable(),
    responseBody: p.json<unknown>().nullable(),
    createdAt: p.datetime(),
    expiresAt: p.datetime(),
  },
});
export type IIdempotencyKey = InferEntity<typeof IdempotencyKey>;
