// Organization members, as administrators manage them.
import { z } from 'zod';
import { roleSchema } from './roles';

export const passwordSchema = z
  .string()
  .min(12, 'Use at least 12 characters.')
  .max(200)
  .refine((p) => /[A-Za-z]/.test(p) && /[^A-Za-z]/.test(p), 'Mix letters with digits or symbols.');

export const memberCreateSchema = z.object({
  email: z.string().trim().toLowerCase().email('Enter an e-mail address.').max(254),
  displayName: z.string().trim().min(1, 'Enter a name.').max(120),
  role: roleSchema,
  password: passwordSchema,
});
export type MemberCreate = z.infer<typeof memberCreateSchema>;

// An administrator sets a new password for a member (who then signs in with it and may change it).
export const memberPasswordSchema = z.object({ password: passwordSchema });
export type MemberPassword = z.infer<typeof memberPasswordSchema>;

// Anyone signed in changes their own password: the current one proves it is them, not a
// borrowed browser.
export const ownPasswordChangeSchema = z
  .object({
    currentPassword: z.string().min(1, 'Enter your current password.').max(200),
    newPassword: passwordSchema,
  })
  .refine((v) => v.newPassword !== v.currentPassword, { path: ['newPassword'], message: 'Choose a password other than the current one.' });
export type OwnPasswordChange = z.infer<typeof ownPasswordChangeSchema>;

export const memberUpdateSchema = z.object({ role: roleSchema });
export type MemberUpdate = z.infer<typeof memberUpdateSchema>;

export const memberSchema = z.object({
  userId: z.string().uuid(),
  email: z.string(),
  displayName: z.string(),
  role: roleSchema,
  joinedAt: z.string(),
  // Set while repeated failed sign-ins keep the account locked.
  lockedUntil: z.string().nullable(),
});
export type Member = z.infer<typeof memberSchema>;

export const memberListSchema = z.object({ members: z.array(memberSchema) });

export const userIdParamsSchema = z.object({ userId: z.string().uuid('Not a valid identifier.') });
