import { defineEntity, p, type InferEntity } from '@mikro-orm/core';
import { baseProperties } from '../common/base';
import { Organization } from '../organizations/organization.entity';
import { ROLES } from '../../../shared/permissions';

export const User = defineEntity({
  name: 'User',
  tableName: 'app_user',
  properties: {
    ...baseProperties,
    email: p.string().length(254).unique(),
    name: p.string().length(120),
    /** argon2id hash; null until an invitation is accepted. */
    passwordHash: p.string().length(255).nullable(), // never serialised: responses are mapped by hand
    lastSignInAt: p.datetime().nullable(),
  },
});
export type IUser = InferEntity<typeof User>;

/** A user's role in one organisation (shop). */
export const Membership = defineEntity({
  name: 'Membership',
  tableName: 'membership',
  uniques: [{ properties: ['user', 'organization'] }],
  properties: {
    ...baseProperties,
    user: () => p.manyToOne(User).ref(),
    organization: () => p.manyToOne(Organization).ref(),
    role: p.enum(ROLES as unknown as ['operator', 'technician', 'safety', 'admin']),
    active: p.boolean().default(true),
  },
});
export type IMembership = InferEntity<typeof Membership>;

/** Single-use, expiring links for invitations and password resets; only the hash is kept. */
export const UserToken = defineEntity({
  name: 'UserToken',
  tableName: 'user_token',
  properties: {
    ...baseProperties,
    user: () => p.manyToOne(User).ref(),
    purpose: p.enum(['invite', 'reset'] as const),
    tokenHash: p.string().length(64).unique(),
    expiresAt: p.datetime(),
    usedAt: p.datetime().nullable(),
  },
});
export type IUserToken = InferEntity<typeof UserToken>;
