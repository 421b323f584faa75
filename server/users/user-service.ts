import bcrypt from 'bcrypt';
import { randomUUID } from 'node:crypto';
import type { DataSource, EntityManager } from 'typeorm';
import { seesAllSites, type Role, type SessionUser } from '../../shared/auth/roles';
import { AppError, notFound } from '../core/errors';
import { SiteMemberEntity } from '../sites/site-member.entity';
import { UserEntity } from './user.entity';

/** bcrypt cost: ~60 ms per check here, slow enough for stolen hashes, quick enough for sign-in. */
export const BCRYPT_ROUNDS = 10;

// Compared against when the e-mail is unknown, so both failures take the same time.
const DUMMY_HASH = bcrypt.hashSync('not-a-real-password', BCRYPT_ROUNDS);

export async function hashPassword(password: string): Promise<string> {
  return bcrypt.hash(password, BCRYPT_ROUNDS);
}

export type CredentialCheck = { ok: true; user: UserEntity } | { ok: false; reason: 'invalid' | 'disabled' };

export async function checkCredentials(ds: DataSource, email: string, password: string): Promise<CredentialCheck> {
  const user = await ds.getRepository(UserEntity).findOneBy({ email: email.toLowerCase() });
  const matches = await bcrypt.compare(password, user?.passwordHash ?? DUMMY_HASH);
  if (!user || !matches) return { ok: false, reason: 'invalid' };
  if (user.disabled) return { ok: false, reason: 'disabled' };
  return { ok: true, user };
}

/** Site ids a user may read: every site for lab and admin, their memberships otherwise. */
export async function readableSiteIds(db: DataSource | EntityManager, userId: string, roles: readonly Role[]): Promise<string[]> {
  const rows: { id: string }[] = seesAllSites(roles)
    ? await db.query(`SELECT id FROM site WHERE NOT deleted ORDER BY name`)
    : await db.query(
        `SELECT s.id FROM site s JOIN site_member m ON m.site_id = s.id
          WHERE m.user_id = $1 AND NOT s.deleted ORDER BY s.name`,
        [userId],
      );
  return rows.map((r) => r.id);
}

export async function toSessionUser(db: DataSource | EntityManager, user: UserEntity): Promise<SessionUser> {
  return {
    id: user.id,
    email: user.email,
    displayName: user.displayName,
    roles: [...user.roles],
    siteIds: await readableSiteIds(db, user.id, user.roles),
  };
}

export async function loadSessionUser(ds: DataSource, id: string): Promise<SessionUser | null> {
  const user = await ds.getRepository(UserEntity).findOneBy({ id });
  if (!user || user.disabled) return null;
  return toSessionUser(ds, user);
}

export interface NewUser {
  email: string;
  displayName: string;
  password: string;
  roles: Role[];
  siteIds: string[];
}

export async function createUser(ds: DataSource, input: NewUser): Promise<SessionUser> {
  return ds.transaction(async (em) => {
    if (await em.getRepository(UserEntity).existsBy({ email: input.email })) {
      throw new AppError(409, 'A user with this e-mail already exists', [{ path: 'email', message: 'Already in use' }]);
    }
    const user = em.getRepository(UserEntity).create({
      id: randomUUID(),
      email: input.email,
      displayName: input.displayName,
      passwordHash: await hashPassword(input.password),
      roles: input.roles,
      disabled: false,
    });
    await em.getRepository(UserEntity).insert(user);
    await setMemberships(em, user.id, input.siteIds);
    return toSessionUser(em, user);
  });
}

export interface UserChanges {
  displayName?: string;
  roles?: Role[];
  siteIds?: string[];
  disabled?: boolean;
}

export async function updateUser(ds: DataSource, id: string, changes: UserChanges): Promise<SessionUser & { disabled: boolean }> {
  return ds.transaction(async (em) => {
    const repo = em.getRepository(UserEntity);
    const user = await repo.findOneBy({ id });
    if (!user) throw notFound('No such user');
    if (changes.displayName !== undefined) user.displayName = changes.displayName;
    if (changes.roles !== undefined) user.roles = changes.roles;
    if (changes.disabled !== undefined) user.disabled = changes.disabled;
    await repo.save(user);
    if (changes.siteIds !== undefined) await setMemberships(em, id, changes.siteIds);
    if (changes.disabled) {
      // A disabled user's open sessions end now, not when their cookie expires.
      await em.query(`DELETE FROM session WHERE sess->'passport'->>'user' = $1`, [id]);
    }
    return { ...(await toSessionUser(em, user)), disabled: user.disabled };
  });
}

async function setMemberships(em: EntityManager, userId: string, siteIds: string[]): Promise<void> {
  const unique = [...new Set(siteIds)];
  if (unique.length) {
    const found: { id: string }[] = await em.query(`SELECT id FROM site WHERE id = ANY($1::uuid[])`, [unique]);
    const missing = unique.filter((s) => !found.some((f) => f.id === s));
    if (missing.length) throw new AppError(400, 'Unknown site', [{ path: 'siteIds', message: `No site ${missing.join(', ')}` }]);
  }
  await em.delete(SiteMemberEntity, { userId });
  if (unique.length)
    await em.insert(
      SiteMemberEntity,
      unique.map((siteId) => ({ siteId, userId })),
    );
}

export async function listUsers(ds: DataSource) {
  const users = await ds.getRepository(UserEntity).find({ order: { email: 'ASC' } });
  return Promise.all(users.map(async (u) => ({ ...(await toSessionUser(ds, u)), disabled: u.disabled })));
}
