import { Passport } from 'passport';
import { Strategy as LocalStrategy } from 'passport-local';
import type { Database } from '../db/database';
import { burnPasswordCheck, verifyPassword } from './passwords';
import { findUserById, findUserWithHashByEmail, type AuthUser } from './user-store';

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    interface User extends AuthUser {}
  }
}

/** A passport instance of our own (not the global singleton) so two apps in one process stay apart. */
export function createPassport(db: Database): InstanceType<typeof Passport> {
  const passport = new Passport();
  passport.use(
    new LocalStrategy({ usernameField: 'email', passwordField: 'password' }, (email, password, done) => {
      findUserWithHashByEmail(db, email)
        .then(async (row) => {
          if (!row) {
            await burnPasswordCheck(password);
            return done(null, false);
          }
          const { passwordHash, ...user } = row;
          return (await verifyPassword(password, passwordHash)) ? done(null, user) : done(null, false);
        })
        .catch(done);
    }),
  );
  passport.serializeUser((user, done) => done(null, user.id));
  passport.deserializeUser((id: unknown, done) => {
    if (typeof id !== 'number') return done(null, false);
    // A deleted account ends its sessions: false makes passport drop the user from the request.
    findUserById(db, id)
      .then((user) => done(null, user ?? false))
      .catch(done);
  });
  return passport;
}
