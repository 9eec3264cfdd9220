// Sign-in and the current session, as the client sees them.
import { z } from 'zod';
import { roleSchema } from './roles';

export const signInRequestSchema = z.object({
  email: z.string().trim().toLowerCase().email('Enter an e-mail address.').max(254),
  password: z.string().min(1, 'Enter your password.').max(200),
});
export type SignInRequest = z.infer<typeof signInRequestSchema>;

export const membershipSchema = z.object({
  organizationId: z.string().uuid(),
  organizationName: z.string(),
  role: roleSchema,
});
export type Membership = z.infer<typeof membershipSchema>;

export const sessionUserSchema = z.object({
  id: z.string().uuid(),
  email: z.string(),
  displayName: z.string(),
  memberships: z.array(membershipSchema),
  // The organization whose records this session works on, and the user's role there.
  organizationId: z.string().uuid(),
  role: roleSchema,
});
export type SessionUser = z.infer<typeof sessionUserSchema>;

export const sessionResponseSchema = z.object({
  user: sessionUserSchema.nullable(),
  csrfToken: z.string(),
});
export type SessionResponse = z.infer<typeof sessionResponseSchema>;

export const switchOrganizationRequestSchema = z.object({ organizationId: z.string().uuid() });
