import { Role, SessionUser, SiteSummary } from '../session-user';

/** Invented users and sites for component tests (the same shape the server sends). */
export const TEST_SITES: SiteSummary[] = [
  { id: 'site-a', name: 'Hollow Creek Meadow', timezone: 'Europe/Vienna' },
  { id: 'site-b', name: 'Ridge Pine Plots', timezone: 'Europe/Vienna' },
];

export function testUser(roles: Role[], overrides: Partial<SessionUser> = {}): SessionUser {
  return {
    id: `user-${roles.join('-') || 'none'}`,
    email: `${roles[0] ?? 'nobody'}@fluxwalk.example`,
    displayName: `Test ${roles.join(' & ') || 'nobody'}`,
    roles,
    siteIds: TEST_SITES.map((s) => s.id),
    ...overrides,
  };
}

/** Puts a signed-in user into device storage, as a previous online sign-in would have. */
export function rememberOnDevice(user: SessionUser, sites: SiteSummary[] = TEST_SITES): void {
  localStorage.setItem('fw.session', JSON.stringify({ user, sites }));
}
