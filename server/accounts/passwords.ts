import bcrypt from 'bcrypt';
import type { DataSource } from 'typeorm';
import { AppError } from '../core/errors';
import type { Mailer } from '../mail/mailer';
import { hashPassword } from '../users/user-service';
import { issueToken, markUsed, openToken, RESET_TTL_MS } from './account-tokens';
import { resetMail } from './account-mails';
import { assertGoodPassword } from './password-policy';

/**
 * Changes the signed-in user's password after checking the current one, and ends the user's
 * other sessions (a stolen session must not outlive the change); this one stays signed in.
 */
export async function changePassword(ds: DataSource, userId: string, sessionId: string, current: string, next: string): Promise<void> {
  const [user] = await ds.query(`SELECT email, password_hash FROM app_user WHERE id = $1 AND NOT disabled`, [userId]);
  if (!user) throw new AppError(401, 'Sign in to continue');
  if (!(await bcrypt.compare(current, user.password_hash))) {
    throw new AppError(400, 'The current password is not right', [{ path: 'currentPassword', message: 'Not your current password' }]);
  }
  assertGoodPassword(next, user.email, 'newPassword');
  if (await bcrypt.compare(next, user.password_hash)) {
    throw new AppError(400, 'Choose another password', [{ path: 'newPassword', message: 'This is your current password' }]);
  }
  const hash = await hashPassword(next);
  await ds.transaction(async (em) => {
    await em.query(`UPDATE app_user SET password_hash = $2 WHERE id = $1`, [userId, hash]);
    await em.query(`DELETE FROM session WHERE sess->'passport'->>'user' = $1 AND sid <> $2`, [userId, sessionId]);
  });
}

/**
 * Mails a reset link when the address belongs to an enabled account, and does nothing
 * otherwise. The caller answers the same either way and before this finishes, so neither the
 * answer nor its timing tells whether the address exists.
 */
export async function requestReset(ds: DataSource, mailer: Mailer, email: string, origin: string): Promise<boolean> {
  const [user] = await ds.query(`SELECT id, display_name FROM app_user WHERE email = $1 AND NOT disabled`, [email]);
  if (!user) return false;
  const issued = await ds.transaction((em) => issueToken(em, { kind: 'reset', email, userId: user.id, ttlMs: RESET_TTL_MS }));
  const link = `${origin}/reset-password?token=${encodeURIComponent(issued.token)}`;
  await mailer.send(resetMail({ to: email, displayName: user.display_name, link, minutes: Math.round(RESET_TTL_MS / 60_000) }));
  return true;
}

/** Sets the new password from a reset link and ends every session of the account. */
export async function confirmReset(ds: DataSource, token: string, password: string): Promise<void> {
  await ds.transaction(async (em) => {
    const row = await openToken(em, 'reset', token, true);
    assertGoodPassword(password, row.email);
    const [user] = await em.query(`SELECT id FROM app_user WHERE id = $1 AND NOT disabled`, [row.user_id]);
    if (!user) throw new AppError(410, 'This account is disabled; ask an admin.');
    await em.query(`UPDATE app_user SET password_hash = $2 WHERE id = $1`, [user.id, await hashPassword(password)]);
    await markUsed(em, row.id);
    await em.query(`DELETE FROM session WHERE sess->'passport'->>'user' = $1`, [user.id]);
  });
}
