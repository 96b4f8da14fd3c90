import { z } from 'zod';
import { LIMITS } from '../../src/contracts/intake';

export const Email = z
  .string()
  .trim()
  .max(LIMITS.email, `E-mail must be at most ${LIMITS.email} characters.`)
  .email('Enter a valid e-mail address.')
  .transform((s) => s.toLowerCase());

export const Password = z
  .string()
  .min(LIMITS.passwordMin, `Password must be at least ${LIMITS.passwordMin} characters.`)
  .max(LIMITS.passwordMax, `Password must be at most ${LIMITS.passwordMax} characters.`);

export const PersonName = z.string().trim().min(1, 'Name is required.').max(LIMITS.name, `Name must be at most ${LIMITS.name} characters.`);

export const SignInBody = z.strictObject({
  email: z.string().trim().min(1, 'E-mail is required.').max(LIMITS.email),
  password: z.string().min(1, 'Password is required.').max(LIMITS.passwordMax),
});

export const ResetRequestBody = z.strictObject({ email: Email });
export const ResetCompleteBody = z.strictObject({ password: Password });
export const ChangePasswordBody = z.strictObject({
  currentPassword: z.string().min(1, 'Current password is required.').max(LIMITS.passwordMax, 'That is not your current password.'),
  newPassword: Password,
});
export const AcceptInvitationBody = z.strictObject({ name: PersonName, password: Password });
export const InviteCoachBody = z.strictObject({ email: Email, name: PersonName });
