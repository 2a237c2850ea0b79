import { Passport } from 'passport';
import { Strategy as LocalStrategy } from 'passport-local';
import type { Database } from '../db/database';
import { burnPasswordCheck, checkPassword, hashPassword } from './passwords';
import { findUserById, findUserWithHashByEmail, replacePasswordHash, type AuthUser } from './user-store';

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
          // An unknown (or removed) e-mail costs one derivation at the current cost, like a wrong password.
          if (!row) {
            await burnPasswordCheck(password);
            return done(null, false);
          }
          const { passwordHash, ...user } = row;
          const check = await checkPassword(password, passwordHash);
          if (!check.match) return done(null, false);
          // The password is at hand only now: a legacy bcrypt hash (or an older cost) becomes scrypt.
          if (check.rehash) await replacePasswordHash(db, user.id, passwordHash, await hashPassword(password));
          return done(null, user);
        })
        .catch(done);
    }),
  );
  // The session keeps the id and the generation it was opened under; sign-out everywhere raises it.
  passport.serializeUser((user, done) => done(null, { id: user.id, generation: user.sessionGeneration }));
  passport.deserializeUser((stored: unknown, done) => {
    const ref = sessionRef(stored);
    if (!ref) return done(null, false);
    // A removed account or an older generation ends the session: false drops the user from the request.
    findUserById(db, ref.id)
      .then((user) => done(null, user && user.sessionGeneration === ref.generation ? user : false))
      .catch(done);
  });
  return passport;
}

/** Sessions from before generations were stored hold a bare id: they count as generation 0. */
function sessionRef(stored: unknown): { id: number; generation: number } | null {
  if (typeof stored === 'number') return { id: stored, generation: 0 };
  if (typeof stored !== 'object' || stored === null) return null;
  const { id, generation } = stored as { id?: unknown; generation?: unknown };
  return typeof id === 'number' && typeof generation === 'number' ? { id, generation } : null;
}
