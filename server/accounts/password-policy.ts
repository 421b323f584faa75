import { MIN_PASSWORD_LENGTH } from '../../shared/auth/user-schemas';
import { AppError } from '../core/errors';
import { COMMON_PASSWORDS, COMMON_WORDS } from './common-passwords';

export const MAX_PASSWORD_LENGTH = 200;

/**
 * Why a password is refused, or null when it is fine: too short, too long, on our list of
 * obvious passwords (also when only digits and punctuation were added to a listed word or the
 * case changed), one character repeated, or the account's own e-mail in it.
 */
export function passwordProblem(password: string, email: string): string | null {
  if (password.length < MIN_PASSWORD_LENGTH) return `Use at least ${MIN_PASSWORD_LENGTH} characters`;
  if (password.length > MAX_PASSWORD_LENGTH) return `Use at most ${MAX_PASSWORD_LENGTH} characters`;
  const lower = password.toLowerCase();
  const core = lower.replace(/[\d\W_]+$/, '').replace(/^[\d\W_]+/, '');
  if (COMMON_PASSWORDS.has(lower) || COMMON_WORDS.includes(core)) return 'This password is too common; choose one that is harder to guess';
  if (/^(.)\1+$/.test(password)) return 'Do not repeat one character; choose a longer mix';
  const local = email.toLowerCase().split('@')[0];
  if (local.length >= 4 && lower.includes(local)) return 'Do not use your e-mail address in the password';
  return null;
}

export function assertGoodPassword(password: string, email: string, field = 'password'): void {
  const problem = passwordProblem(password, email);
  if (problem) throw new AppError(400, 'Choose another password', [{ path: field, message: problem }]);
}
