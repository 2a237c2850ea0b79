import { eq } from 'drizzle-orm';
import { users } from '../../drizzle/schema';
import type { SessionUser } from '../../shared/protocol/api-types';
import type { Database } from '../db/database';

/** A signed-in user as the server keeps it in the request (the API's SessionUser plus the team). */
export interface AuthUser extends SessionUser {
  teamId: number;
}

const columns = { id: users.id, teamId: users.teamId, email: users.email, displayName: users.displayName, role: users.role };

export async function findUserById(db: Database, id: number): Promise<AuthUser | null> {
  const [row] = await db.select(columns).from(users).where(eq(users.id, id));
  return row ?? null;
}

export async function findUserWithHashByEmail(db: Database, email: string): Promise<(AuthUser & { passwordHash: string }) | null> {
  const [row] = await db
    .select({ ...columns, passwordHash: users.passwordHash })
    .from(users)
    .where(eq(users.email, email.trim().toLowerCase()));
  return row ?? null;
}

export function toSessionUser(user: AuthUser): SessionUser {
  return { id: user.id, email: user.email, displayName: user.displayName, role: user.role };
}
