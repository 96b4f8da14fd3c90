import { errorCode, errorMessage, errorStatus } from '../../core/api-error';

/** What to tell someone whose e-mailed link (invitation or password reset) does not work. */
export function tokenProblem(err: unknown, kind: 'invitation' | 'reset'): string {
  const code = errorCode(err);
  const status = errorStatus(err);
  const link = kind === 'invitation' ? 'invitation' : 'password reset link';
  if (code === 'token_expired') {
    return kind === 'invitation'
      ? 'This invitation has expired. Ask your clinic to send a new one.'
      : 'This password reset link has expired. Ask for a new one below.';
  }
  if (code === 'token_used') {
    return kind === 'invitation'
      ? 'This invitation has already been accepted. Sign in with the password you chose.'
      : 'This password reset link has already been used. Ask for a new one if you still need it.';
  }
  if (status === 404) return `We don't recognise this ${link}. Check that you copied the whole address.`;
  if (status === 410) return `This ${link} can no longer be used.`;
  return errorMessage(err);
}
