import { Passport } from 'passport';
import { Strategy as LocalStrategy } from 'passport-local';
import type { DataSource } from 'typeorm';
import { checkCredentials, loadSessionUser, toSessionUser } from '../users/user-service';

/** One passport instance per app (tests run two apps in one process). The session stores the user id only. */
export function createPassport(ds: DataSource): InstanceType<typeof Passport> {
  const passport = new Passport();
  passport.use(
    new LocalStrategy({ usernameField: 'email', passwordField: 'password' }, (email, password, done) => {
      checkCredentials(ds, email, password)
        .then(async (check) => (check.ok ? done(null, await toSessionUser(ds, check.user)) : done(null, false, { message: check.reason })))
        .catch(done);
    }),
  );
  passport.serializeUser((user, done) => done(null, user.id));
  // Roles and memberships are read fresh on every request, so an admin's change applies at once.
  passport.deserializeUser((id: string, done) => {
    loadSessionUser(ds, id).then((u) => done(null, u ?? false), done);
  });
  return passport;
}
