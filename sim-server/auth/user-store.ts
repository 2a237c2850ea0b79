import { and, eq, isNull } from 'drizzle-orm';
import { users } from '../../drizzle/schema';
import type { SessionUser } from '../../shared/protocol/api-types';
import type { Database } from '../db/database';

/** A signed-in user as the server keeps it in the request (the API's SessionUser plus the team). */
export interface AuthUser extends SessionUser {
  teamId: number;
  /** Sessions carrying an older number are signed out (sign-out everywhere, password reset). */
  sessionGeneration: number;
}

const columns = { id: users.id, teamId: users.teamId, email: users.email, displayName: users.displayName, role: users.role, sessionGeneration: users.sessionGeneration };

/** An active (not removed) user by id. */
export async function findUserById(db: Database, id: number): Promise<AuthUser | null> {
  const [row] = await db
    .select(columns)
    .from(users)
    .where(and(eq(users.id, id), isNull(users.deactivatedAt)));
  return row ?? null;
}

/** An active user by e-mail, with the password hash for sign-in. */
export async function findUserWithHashByEmail(db: Database, email: string): Promise<(AuthUser & { passwordHash: string }) | null> {
  const [row] = await db
    .select({ ...columns, passwordHash: users.passwordHash })
    .from(users)
    .where(and(eq(users.email, email.trim().toLowerCase()), isNull(users.deactivatedAt)));
  return row ?? null;
}

export function toSessionUser(user: AuthUser): SessionUser {
  return { id: user.id, email: user.email, displayName: user.displayName, role: user.role };
}

/**
 * Replaces a password hash with a new one of the current scheme, only if the stored hash is still
 * the one just checked (a reset or a second sign-in may have replaced it meanwhile).
 */
export async function replacePasswordHash(db: Database, id: number, checkedHash: string, newHash: string): Promise<void> {
  await db
    .update(users)
    .set({ passwordHash: newHash })
    .where(and(eq(users.id, id), eq(users.passwordHash, checkedHash)));
}
