import { z } from 'zod';
import { emailSchema, userSchema } from './users';

/** Passwords: long enough to resist guessing, and not one of the obvious ones. */
export const minimumPasswordLength = 10;
const obviousPasswords = new Set([
  'password12', 'password123', '1234567890', '0123456789', 'qwertyuiop', 'letmein123',
  'administrator', 'changeme123', 'welcome123', 'iloveyou12', 'rejectra123', 'passw0rd12',
]);

export const newPasswordSchema = z
  .string({ error: 'Password is required' })
  .min(minimumPasswordLength, `Password must be at least ${minimumPasswordLength} characters`)
  .max(256, 'Password is longer than 256 characters')
  .refine((value) => !obviousPasswords.has(value.toLowerCase()), 'This password is too common; choose another')
  .refine((value) => new Set(value).size >= 4, 'Password repeats too few different characters');

export const signInRequestSchema = z.object({
  email: emailSchema,
  password: z.string({ error: 'Password is required' }).min(1, 'Password is required').max(256),
});
export type SignInRequest = z.infer<typeof signInRequestSchema>;

export const sessionResponseSchema = z.object({ user: userSchema });
export type SessionResponse = z.infer<typeof sessionResponseSchema>;

export const forgotPasswordRequestSchema = z.object({ email: emailSchema });
export type ForgotPasswordRequest = z.infer<typeof forgotPasswordRequestSchema>;

/** Setting a password from an e-mailed link (invitation or reset). */
export const setPasswordRequestSchema = z.object({
  token: z.string({ error: 'Link token is required' }).min(20, 'Link token is malformed').max(200),
  password: newPasswordSchema,
});
export type SetPasswordRequest = z.infer<typeof setPasswordRequestSchema>;

/** What a link token is for, shown before the person chooses a password. */
export const linkInfoResponseSchema = z.object({
  purpose: z.enum(['invite', 'reset']),
  email: z.string(),
  name: z.string(),
  expiresAt: z.string(),
});
export type LinkInfoResponse = z.infer<typeof linkInfoResponseSchema>;

/** Every API error has this shape; `fields` maps a request field to what is wrong with it. */
export const apiErrorSchema = z.object({
  error: z.string(),
  fields: z.record(z.string(), z.string()).optional(),
});
export type ApiError = z.infer<typeof apiErrorSchema>;

export const healthResponseSchema = z.object({
  status: z.enum(['ok', 'degraded']),
  database: z.enum(['up', 'down']),
  mail: z.enum(['local-stand-in', 'smtp']),
  version: z.string(),
});
export type HealthResponse = z.infer<typeof healthResponseSchema>;

/** Messages the local mail stand-in received (development and tests only). */
export const mailMessageSummarySchema = z.object({
  id: z.string(),
  to: z.string(),
  subject: z.string(),
  receivedAt: z.string(),
});
export const mailListResponseSchema = z.object({ messages: z.array(mailMessageSummarySchema) });
export const mailMessageResponseSchema = mailMessageSummarySchema.extend({
  from: z.string(),
  text: z.string(),
  html: z.string().nullable(),
});
export type MailMessageSummary = z.infer<typeof mailMessageSummarySchema>;
export type MailMessage = z.infer<typeof mailMessageResponseSchema>;
