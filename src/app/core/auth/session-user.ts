import { LEAD_INVITES, ROLES, type Role, type SessionUser } from '../../../../shared/auth/roles';

/** The signed-in user as the server describes it (`/api/auth/login`, `/api/auth/me`): one type, from shared/. */
export { LEAD_INVITES, ROLES, type Role, type SessionUser };

export interface SiteSummary {
  id: string;
  name: string;
  timezone: string;
}

function isRecord(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

function isRole(v: unknown): v is Role {
  return typeof v === 'string' && (ROLES as readonly string[]).includes(v);
}

/**
 * Checks a user that came off the wire or out of device storage. Unknown roles are dropped
 * (a newer server may know more roles than this build) rather than rejecting the whole user.
 */
export function parseSessionUser(v: unknown): SessionUser | null {
  if (!isRecord(v)) return null;
  const { id, email, displayName, roles, siteIds } = v;
  if (typeof id !== 'string' && typeof id !== 'number') return null;
  if (typeof email !== 'string' || !Array.isArray(roles)) return null;
  return {
    id: String(id),
    email,
    displayName: typeof displayName === 'string' && displayName.trim() ? displayName : email,
    roles: roles.filter(isRole),
    siteIds: Array.isArray(siteIds) ? siteIds.map((s) => String(s)) : [],
  };
}

/** A site as the session lists it: an id (a number from an older server) and a name. */
function isSite(v: unknown): v is { id: string | number; name: string; timezone?: unknown } {
  return (
    typeof v === 'object' &&
    v !== null &&
    'id' in v &&
    (typeof v.id === 'string' || typeof v.id === 'number') &&
    'name' in v &&
    typeof v.name === 'string'
  );
}

/**
 * The sites of a session off the wire or out of device storage; an entry that is not a site is
 * left out, and a site without a zone (an older copy in device storage) counts as UTC. Checked by
 * hand, not with zod: this runs before sign-in, and zod would add about 220 kB to the first download.
 */
export function parseSites(v: unknown): SiteSummary[] {
  if (!Array.isArray(v)) return [];
  return v.filter(isSite).map((s) => ({ id: String(s.id), name: s.name, timezone: typeof s.timezone === 'string' ? s.timezone : 'UTC' }));
}
