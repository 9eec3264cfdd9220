// Password forms: a new password typed twice (the member's own change, an administrator's
// reset), checked with the server's own rules before anything is sent.
import { ownPasswordChangeSchema, memberPasswordSchema, type MemberPassword, type OwnPasswordChange } from '@shared/api/users';
import { parseForm, type FieldErrors } from './zod-errors';

export type OwnPasswordFormValues = { currentPassword: string; newPassword: string; repeat: string };
export type ResetPasswordFormValues = { password: string; repeat: string };

type Result<T> = { ok: true; value: T } | { ok: false; errors: FieldErrors };

export const emptyOwnPasswordForm = (): OwnPasswordFormValues => ({ currentPassword: '', newPassword: '', repeat: '' });
export const emptyResetPasswordForm = (): ResetPasswordFormValues => ({ password: '', repeat: '' });

const mismatch = 'The two passwords differ.';

export function validateOwnPasswordChange(values: OwnPasswordFormValues): Result<OwnPasswordChange> {
  const parsed = parseForm(ownPasswordChangeSchema, { currentPassword: values.currentPassword, newPassword: values.newPassword });
  if (values.repeat !== values.newPassword) return { ok: false, errors: { ...(parsed.ok ? {} : parsed.errors), repeat: mismatch } };
  return parsed;
}

export function validatePasswordReset(values: ResetPasswordFormValues): Result<MemberPassword> {
  const parsed = parseForm(memberPasswordSchema, { password: values.password });
  if (values.repeat !== values.password) return { ok: false, errors: { ...(parsed.ok ? {} : parsed.errors), repeat: mismatch } };
  return parsed;
}
