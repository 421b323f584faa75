/** The four roles; a user's rights are the union of the rights of their roles. */
export const ROLES = ['crew', 'lead', 'lab', 'admin'] as const;
export type Role = (typeof ROLES)[number];

/** Roles that see every site; crew and leads see only the sites they are members of. */
export const ALL_SITES_ROLES: readonly Role[] = ['lab', 'admin'];

/** The roles a lead may give in an invitation (to the lead's own sites); admins invite any role. */
export const LEAD_INVITES: readonly Role[] = ['crew'];

export function seesAllSites(roles: readonly Role[]): boolean {
  return roles.some((r) => ALL_SITES_ROLES.includes(r));
}

/** Whether a user may read the records of a site: every site for lab and admin, their memberships otherwise. */
export function readsSite(user: { roles: readonly Role[]; siteIds: readonly string[] }, siteId: string): boolean {
  return seesAllSites(user.roles) || user.siteIds.includes(siteId);
}

/** What the API answers for the signed-in user (`/api/auth/login`, `/api/auth/me`). */
export interface SessionUser {
  id: string;
  email: string;
  displayName: string;
  roles: Role[];
  siteIds: string[];
}
