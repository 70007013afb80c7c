import { z } from 'zod';
import { ROLES } from '../permissions';
import { email } from './common';
import { paging } from './paging';
import { oneLine } from './text';

export const roleSchema = z.enum(ROLES, { message: 'Choose a role' });

export const inviteUserSchema = z.object({
  name: oneLine(z.string().trim().min(2, 'Enter the person’s name').max(120, 'Name is too long')),
  email,
  role: roleSchema,
});
export type InviteUserInput = z.infer<typeof inviteUserSchema>;

export const updateMemberSchema = z
  .object({ role: roleSchema.optional(), active: z.boolean().optional() })
  .refine((v) => v.role !== undefined || v.active !== undefined, { message: 'Nothing to change' });
export type UpdateMemberInput = z.infer<typeof updateMemberSchema>;

export const listUsersQuery = paging.extend({
  q: z.string().trim().max(100).optional(),
  role: roleSchema.optional(),
  status: z.enum(['active', 'invited', 'deactivated']).optional(),
  sort: z.enum(['name', 'email', 'role', 'status', 'lastSignInAt']).default('name'),
  dir: z.enum(['asc', 'desc']).default('asc'),
});
export type ListUsersQuery = z.infer<typeof listUsersQuery>;

export type MemberRow = {
  membershipId: string;
  userId: string;
  name: string;
  email: string;
  role: (typeof ROLES)[number];
  status: 'active' | 'invited' | 'deactivated';
  lastSignInAt: string | null;
};
