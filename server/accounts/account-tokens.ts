import { createHash, randomBytes, randomUUID } from 'node:crypto';
import type { EntityManager } from 'typeorm';
import { AppError } from '../core/errors';

export type TokenKind = 'invitation' | 'reset';

/** Invitations wait a week; a reset link is for someone at the keyboard now. */
export const INVITATION_TTL_MS = 7 * 24 * 3_600_000;
export const RESET_TTL_MS = 60 * 60_000;

export interface TokenRow {
  id: string;
  kind: TokenKind;
  email: string;
  user_id: string | null;
  roles: string[] | null;
  site_ids: string[] | null;
  created_by: string | null;
  expires_at: Date;
  used_at: Date | null;
  revoked_at: Date | null;
}

/** 32 random bytes: the hash needs no salt or slow function, nobody can guess the preimage. */
export const hashToken = (token: string) => createHash('sha256').update(token, 'utf8').digest('hex');

export interface NewToken {
  kind: TokenKind;
  email: string;
  userId?: string | null;
  roles?: string[] | null;
  siteIds?: string[] | null;
  createdBy?: string | null;
  ttlMs: number;
}

/**
 * Issues a token and revokes every earlier open token of the same kind for the same address,
 * so only the newest link works. Returns the token itself, which exists only in the mail.
 */
export async function issueToken(em: EntityManager, t: NewToken): Promise<{ id: string; token: string; expiresAt: Date }> {
  await em.query(
    `UPDATE account_token SET revoked_at = now()
                   WHERE kind = $1 AND email = $2 AND used_at IS NULL AND revoked_at IS NULL`,
    [t.kind, t.email],
  );
  const token = randomBytes(32).toString('base64url');
  const id = randomUUID();
  const expiresAt = new Date(Date.now() + t.ttlMs);
  await em.query(
    `INSERT INTO account_token (id, kind, token_hash, email, user_id, roles, site_ids, created_by, expires_at)
                  VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9)`,
    [id, t.kind, hashToken(token), t.email, t.userId ?? null, t.roles ?? null, t.siteIds ?? null, t.createdBy ?? null, expiresAt],
  );
  return { id, token, expiresAt };
}

const INVALID: Record<TokenKind, string> = {
  invitation: 'This invitation link is no longer valid: it was used, replaced by a newer one, or it expired. Ask for a new invitation.',
  reset: 'This reset link is no longer valid: it was used, replaced by a newer one, or it expired. Ask for a new link.',
};

/**
 * The open token for `token`, locked for the caller's transaction when `lock` (so two uses at
 * once cannot both pass). Unknown, used, revoked and expired tokens all get the same 410.
 */
export async function openToken(em: EntityManager, kind: TokenKind, token: string, lock: boolean): Promise<TokenRow> {
  const [row]: TokenRow[] = await em.query(
    `SELECT id, kind, email, user_id, roles, site_ids, created_by, expires_at, used_at, revoked_at
       FROM account_token WHERE token_hash = $1 AND kind = $2 ${lock ? 'FOR UPDATE' : ''}`,
    [hashToken(token), kind],
  );
  if (!row || row.used_at || row.revoked_at || row.expires_at.getTime() <= Date.now()) throw new AppError(410, INVALID[kind]);
  return row;
}

export async function markUsed(em: EntityManager, id: string): Promise<void> {
  await em.query(`UPDATE account_token SET used_at = now() WHERE id = $1`, [id]);
}
