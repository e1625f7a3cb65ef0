import { z } from 'zod';

/** Roles, least to most privileged. A lead can do everything a designer can, and so on down. */
export const roles = ['technician', 'designer', 'lead'] as const;
export type Role = (typeof roles)[number];
export const roleSchema = z.enum(roles);

export const roleLabels: Record<Role, string> = {
  technician: 'Technician',
  designer: 'Designer',
  lead: 'Lead',
};

/** What each role is for, shown where roles are chosen. */
export const roleDescriptions: Record<Role, string> = {
  technician: 'Records measurements: bench sessions, sweeps, captures.',
  designer: 'Owns designs and predictions; reviews measurements.',
  lead: 'Everything, plus people and archiving.',
};

export const emailSchema = z
  .string({ error: 'E-mail address is required' })
  .trim()
  .toLowerCase()
  .max(254, 'E-mail address is longer than 254 characters')
  .pipe(z.email({ error: 'Not a valid e-mail address' }));

export const displayNameSchema = z
  .string({ error: 'Name is required' })
  .trim()
  .min(1, 'Name is required')
  .max(120, 'Name is longer than 120 characters');

/** A person as the API shows them. */
export const userSchema = z.object({
  id: z.string(),
  email: z.string(),
  name: z.string(),
  role: roleSchema,
  status: z.enum(['invited', 'active', 'deactivated']),
  createdAt: z.string(),
  lastSignInAt: z.string().nullable(),
});
export type User = z.infer<typeof userSchema>;

export const inviteRequestSchema = z.object({
  email: emailSchema,
  name: displayNameSchema,
  role: roleSchema,
});
export type InviteRequest = z.infer<typeof inviteRequestSchema>;

export const updateUserRequestSchema = z
  .object({
    role: roleSchema.optional(),
    active: z.boolean().optional(),
  })
  .refine((value) => value.role !== undefined || value.active !== undefined, {
    message: 'Give a new role or an active flag',
    path: ['role'],
  });
export type UpdateUserRequest = z.infer<typeof updateUserRequestSchema>;

export const userListResponseSchema = z.object({ users: z.array(userSchema) });
export type UserListResponse = z.infer<typeof userListResponseSchema>;
