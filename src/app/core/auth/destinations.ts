import { Role } from './session-user';

/** The four screen families and who may open them (DESIGN.md: Walk / Board / Bench, plus Setup). */
export type DestinationKey = 'walk' | 'board' | 'bench' | 'setup';

export interface Destination {
  key: DestinationKey;
  path: string;
  label: string;
  icon: string;
  roles: readonly Role[];
}

export const DESTINATIONS: readonly Destination[] = [
  { key: 'walk', path: '/walk', label: 'Walk', icon: 'directions_walk', roles: ['crew', 'lead'] },
  { key: 'board', path: '/board', label: 'Board', icon: 'dashboard', roles: ['lead'] },
  { key: 'bench', path: '/bench', label: 'Bench', icon: 'biotech', roles: ['lab'] },
  { key: 'setup', path: '/setup', label: 'Setup', icon: 'settings', roles: ['admin', 'lead'] },
];

export function destinationsFor(roles: readonly Role[]): Destination[] {
  return DESTINATIONS.filter((d) => d.roles.some((r) => roles.includes(r)));
}

export function mayOpen(key: DestinationKey, roles: readonly Role[]): boolean {
  return destinationsFor(roles).some((d) => d.key === key);
}

/** The first screen after sign-in: the first destination in the order above, if any. */
export function homePathFor(roles: readonly Role[]): string {
  return destinationsFor(roles)[0]?.path ?? '/no-destinations';
}
