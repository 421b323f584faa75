import { z } from 'zod';
import { roleListSchema } from '../../shared/auth/user-schemas';

const email = z.string().trim().toLowerCase().email('Enter an e-mail address').max(254);
// Length and commonness are checked by password-policy.ts, which also knows the account's address.
const password = z.string().min(1, 'Enter a password').max(200, 'Use at most 200 characters');
const token = z.string().trim().min(20, 'The link is incomplete').max(200);

export const invitationSchema = z.object({
  email,
  roles: roleListSchema,
  siteIds: z
    .array(z.string().uuid('Site ids are UUIDs'))
    .max(200)
    .default([])
    .transform((ids) => [...new Set(ids)]),
});
export const tokenSchema = z.object({ token });
export const acceptSchema = z.object({ token, displayName: z.string().trim().min(1, 'Enter your name').max(120), password });
export const changePasswordSchema = z.object({
  currentPassword: z.string().min(1, 'Enter your current password').max(200),
  newPassword: password,
});
export const resetRequestSchema = z.object({ email });
export const resetConfirmSchema = z.object({ token, password });
