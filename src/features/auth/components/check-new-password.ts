import { newPasswordSchema } from '../../../../shared/schemas/auth';

export type NewPasswordErrors = { password?: string; repeat?: string };

/**
 * Check a chosen password before it is sent: the same rules the server applies, plus the two
 * entries matching. Returns an empty object when both are fine.
 */
export function checkNewPassword(password: string, repeat: string): NewPasswordErrors {
  const errors: NewPasswordErrors = {};
  const parsed = newPasswordSchema.safeParse(password);
  if (!parsed.success) errors.password = parsed.error.issues[0]?.message ?? 'Password is not acceptable';
  if (repeat === '') errors.repeat = 'Repeat the password';
  else if (repeat !== password) errors.repeat = 'The two passwords do not match';
  return errors;
}
