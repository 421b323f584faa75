import { randomUUID } from 'node:crypto';
import type { DataSource } from 'typeorm';
import { LEAD_INVITES, type Role, type SessionUser } from '../../shared/auth/roles';
import { AppError, forbidden } from '../core/errors';
import type { Mailer } from '../mail/mailer';
import { INVITATION_TTL_MS, issueToken, markUsed, openToken } from './account-tokens';
import { invitationMail } from './account-mails';
import { assertGoodPassword } from './password-policy';

export interface InvitationInput {
  email: string;
  roles: Role[];
  siteIds: string[];
}

export interface InvitationView {
  id: string;
  email: string;
  roles: Role[];
  sites: { id: string; name: string }[];
  invitedBy: string | null;
  createdAt: string;
  expiresAt: string;
}

/**
 * Who may invite whom: an admin anyone, with any roles and sites; a lead only crew, and only to
 * sites the lead is a member of. Checked before anything is stored.
 */
export function checkInviteRights(actor: SessionUser, input: InvitationInput): void {
  if (actor.roles.includes('admin')) return;
  if (!actor.roles.includes('lead')) throw forbidden('Only admins and leads invite people');
  if (!leadMayGive(input.roles)) throw forbidden('Leads invite crew only; ask an admin for other roles');
  if (!input.siteIds.length)
    throw new AppError(400, 'Choose the site the crew member joins', [{ path: 'siteIds', message: 'Choose at least one site' }]);
  if (!withinSites(actor, input.siteIds)) throw forbidden('Leads invite to their own sites only');
}

const leadMayGive = (roles: readonly Role[]) => roles.length > 0 && roles.every((r) => LEAD_INVITES.includes(r));
const withinSites = (actor: SessionUser, siteIds: readonly string[]) =>
  siteIds.length > 0 && siteIds.every((s) => actor.siteIds.includes(s));

/**
 * The open invitations an actor sees and may withdraw are those the actor could have sent: any
 * for an admin; for a lead only crew invitations to the lead's sites. Others do not exist for a
 * lead (404, never a hint that an admin invited someone as lab or admin).
 */
export function mayManageInvitation(actor: SessionUser, invitation: { roles: readonly Role[]; siteIds: readonly string[] }): boolean {
  if (actor.roles.includes('admin')) return true;
  return actor.roles.includes('lead') && leadMayGive(invitation.roles) && withinSites(actor, invitation.siteIds);
}

async function siteNames(ds: DataSource, ids: string[]): Promise<{ id: string; name: string; timezone: string }[]> {
  if (!ids.length) return [];
  return ds.query(`SELECT id, name, timezone FROM site WHERE id = ANY($1::uuid[]) AND NOT deleted ORDER BY name`, [ids]);
}

/**
 * Stores a new invitation (revoking any earlier open one for the address) and mails the link.
 * If the mail cannot be sent the invitation is rolled back and the inviter told, so nobody
 * waits for a mail that never left.
 */
export async function invite(
  ds: DataSource,
  mailer: Mailer,
  actor: SessionUser,
  input: InvitationInput,
  origin: string,
): Promise<InvitationView> {
  checkInviteRights(actor, input);
  const sites = await siteNames(ds, input.siteIds);
  if (sites.length !== new Set(input.siteIds).size)
    throw new AppError(400, 'Unknown site', [{ path: 'siteIds', message: 'One of the sites does not exist' }]);
  return ds.transaction(async (em) => {
    const [taken] = await em.query(`SELECT 1 FROM app_user WHERE email = $1`, [input.email]);
    if (taken)
      throw new AppError(409, 'This address already has an account', [
        { path: 'email', message: 'Already has an account; change its roles and sites under Members' },
      ]);
    const issued = await issueToken(em, {
      kind: 'invitation',
      email: input.email,
      roles: input.roles,
      siteIds: input.siteIds,
      createdBy: actor.id,
      ttlMs: INVITATION_TTL_MS,
    });
    const link = `${origin}/accept-invitation?token=${encodeURIComponent(issued.token)}`;
    try {
      await mailer.send(
        invitationMail({
          to: input.email,
          inviter: actor.displayName,
          siteNames: sites.map((s) => s.name),
          roles: input.roles,
          link,
          expiresAt: issued.expiresAt,
          timeZone: sites[0]?.timezone ?? null,
        }),
      );
    } catch (err) {
      if (err instanceof AppError) throw err;
      console.error('[mail] invitation not sent:', (err as Error).message);
      throw new AppError(
        502,
        'The invitation e-mail could not be sent, so no invitation was made. Try again later or ask the administrator to check the mail server.',
      );
    }
    return {
      id: issued.id,
      email: input.email,
      roles: input.roles,
      sites,
      invitedBy: actor.displayName,
      createdAt: new Date().toISOString(),
      expiresAt: issued.expiresAt.toISOString(),
    };
  });
}

interface OpenInvitationRow {
  id: string;
  email: string;
  roles: Role[];
  site_ids: string[] | null;
  sites: { id: string; name: string }[];
  invited_by: string | null;
  created_at: Date;
  expires_at: Date;
}

/** Open invitations the actor may manage (mayManageInvitation), newest first. */
export async function listInvitations(ds: DataSource, actor: SessionUser): Promise<InvitationView[]> {
  const rows: OpenInvitationRow[] = await ds.query(`
    SELECT t.id, t.email, t.roles, t.site_ids, t.created_at, t.expires_at, u.display_name AS invited_by,
           coalesce((SELECT json_agg(json_build_object('id', s.id, 'name', s.name) ORDER BY s.name) FROM site s WHERE s.id = ANY(t.site_ids)), '[]') AS sites
      FROM account_token t LEFT JOIN app_user u ON u.id = t.created_by
     WHERE t.kind = 'invitation' AND t.used_at IS NULL AND t.revoked_at IS NULL AND t.expires_at > now()
     ORDER BY t.created_at DESC`);
  return rows
    .filter((r) => mayManageInvitation(actor, { roles: r.roles, siteIds: r.site_ids ?? [] }))
    .map((r) => ({
      id: r.id,
      email: r.email,
      roles: r.roles,
      sites: r.sites,
      invitedBy: r.invited_by ?? null,
      createdAt: r.created_at.toISOString(),
      expiresAt: r.expires_at.toISOString(),
    }));
}

/** Withdraws an open invitation the actor may manage; any other answers 404 like an unknown id. */
export async function revokeInvitation(ds: DataSource, actor: SessionUser, id: string): Promise<void> {
  const [row] = await ds.query(
    `SELECT roles, site_ids FROM account_token WHERE id = $1 AND kind = 'invitation' AND used_at IS NULL AND revoked_at IS NULL`,
    [id],
  );
  if (!row || !mayManageInvitation(actor, { roles: row.roles, siteIds: row.site_ids ?? [] }))
    throw new AppError(404, 'No open invitation with this id');
  await ds.query(`UPDATE account_token SET revoked_at = now() WHERE id = $1`, [id]);
}

/** What the invitee sees before choosing a password. */
export async function lookupInvitation(ds: DataSource, token: string) {
  const row = await ds.transaction((em) => openToken(em, 'invitation', token, false));
  return {
    email: row.email,
    roles: row.roles as Role[],
    sites: (await siteNames(ds, row.site_ids ?? [])).map(({ id, name }) => ({ id, name })),
    expiresAt: row.expires_at.toISOString(),
  };
}

/**
 * Makes the account from the invitation in one transaction with the token locked, so a link
 * used twice at once makes one account. Sites deleted since the invitation are left out.
 */
export async function acceptInvitation(
  ds: DataSource,
  input: { token: string; displayName: string; password: string },
  hash: (p: string) => Promise<string>,
) {
  return ds.transaction(async (em) => {
    const row = await openToken(em, 'invitation', input.token, true);
    assertGoodPassword(input.password, row.email);
    const [taken] = await em.query(`SELECT 1 FROM app_user WHERE email = $1`, [row.email]);
    if (taken) throw new AppError(409, 'This address already has an account; sign in instead.');
    const id = randomUUID();
    const roles = row.roles ?? ['crew'];
    await em.query(`INSERT INTO app_user (id, email, display_name, password_hash, roles) VALUES ($1, $2, $3, $4, $5)`, [
      id,
      row.email,
      input.displayName,
      await hash(input.password),
      roles,
    ]);
    await em.query(
      `INSERT INTO site_member (site_id, user_id)
                    SELECT s.id, $1 FROM site s WHERE s.id = ANY($2::uuid[]) AND NOT s.deleted`,
      [id, row.site_ids ?? []],
    );
    await markUsed(em, row.id);
    return { email: row.email };
  });
}
