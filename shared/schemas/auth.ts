import { z } from 'zod';
import { ROLES } from '../permissions';
import { email, newPassword } from './common';

export const loginSchema = z.object({
  email,
  password: z.string({ message: 'Password is required' }).min(1, 'Password is required').max(200, 'Password is too long'),
});
export type LoginInput = z.infer<typeof loginSchema>;

export const requestResetSchema = z.object({ email });
export const tokenPasswordSchema = z
  .object({
    token: z.string().min(20, 'The link is incomplete').max(200),
    password: newPassword,
    confirm: z.string(),
  })
  .refine((v) => v.password === v.confirm, { path: ['confirm'], message: 'The passwords do not match' });
export type TokenPasswordInput = z.infer<typeof tokenPasswordSchema>;

export const meSchema = z.object({
  user: z.object({ id: z.string(), email: z.string(), name: z.string() }),
  role: z.enum(ROLES),
  organization: z.object({ id: z.string(), name: z.string(), timeZone: z.string(), locale: z.string() }),
});
export type Me = z.infer<typeof meSchema>;
