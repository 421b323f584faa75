import { z } from 'zod';
import { ROLES } from './roles';

export const loginSchema = z.object({
  email: z.string().trim().toLowerCase().email('Enter an e-mail address').max(254),
  password: z.string().min(1, 'Enter your password').max(200),
});

export const roleListSchema = z
  .array(z.enum(ROLES))
  .min(1, 'Give the user at least one role')
  .transform((roles) => [...new Set(roles)]);

export const MIN_PASSWORD_LENGTH = 10;

export const createUserSchema = z.object({
  email: z.string().trim().toLowerCase().email('Enter an e-mail address').max(254),
  displayName: z.string().trim().min(1, 'Enter a display name').max(120),
  password: z.string().min(MIN_PASSWORD_LENGTH, `Use at least ${MIN_PASSWORD_LENGTH} characters`).max(200),
  roles: roleListSchema,
  siteIds: z.array(z.string().uuid('Site ids are UUIDs')).default([]),
});

export const updateUserSchema = z
  .object({
    displayName: z.string().trim().min(1).max(120),
    roles: roleListSchema,
    siteIds: z.array(z.string().uuid('Site ids are UUIDs')),
    disabled: z.boolean(),
  })
  .partial()
  .refine((v) => Object.keys(v).length > 0, 'Nothing to change');
