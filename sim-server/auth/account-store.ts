import { eq, sql } from 'drizzle-orm';
import { invitations, teams, users } from '../../drizzle/schema';
import type { Role } from '../../shared/protocol/api-types';
import type { Database } from '../db/database';
import { AppError } from '../http/app-error';
import { recordActivity } from '../library/activity-log';
import type { Transaction } from '../scenarios/revision-store';
import { hashLinkToken } from './link-tokens';
import { findUserById, type AuthUser } from './user-store';

/** One message for every duplicate: the person signing up owns the address, so naming it is fine. */
export const DUPLICATE_EMAIL = 'An account with this e-mail already exists. Sign in, or reset its password.';

export interface NewAccount {
  email: string;
  displayName: string;
  passwordHash: string;
  teamName?: string;
  invitationToken?: string;
}

/** The invitation a token names, locked; 400 when forged, 410 when used, withdrawn or expired. */
export async function lockInvitation(tx: Pick<Transaction, 'select'>, token: string) {
  const [invitation] = await tx
    .select({ id: invitations.id, teamId: invitations.teamId, email: invitations.email, role: invitations.role, expiresAt: invitations.expiresAt, acceptedAt: invitations.acceptedAt, revokedAt: invitations.revokedAt, teamName: teams.name })
    .from(invitations)
    .innerJoin(teams, eq(teams.id, invitations.teamId))
    .where(eq(invitations.tokenHash, hashLinkToken(token)))
    .for('update', { of: invitations });
  if (!invitation) throw new AppError(400, 'invalid_token', 'This invitation link is not valid. Ask your admin for a new one.', [{ field: 'invitationToken', message: 'not a valid invitation link' }]);
  if (invitation.acceptedAt) throw new AppError(410, 'token_used', 'This invitation link has already been used. Sign in instead.');
  if (invitation.revokedAt) throw new AppError(410, 'token_revoked', 'This invitation was withdrawn or replaced by a newer one. Ask your admin for a new link.');
  if (invitation.expiresAt.getTime() <= Date.now()) throw new AppError(410, 'token_expired', 'This invitation link has expired. Ask your admin for a new one.');
  return invitation;
}

/**
 * Creates an account: with an invitation it joins the inviting team in the invited role (the
 * invitation is used up); without, it founds a team of its own with the new user as admin.
 */
export async function createAccount(db: Database, account: NewAccount): Promise<AuthUser> {
  const id = await db.transaction(async (tx) => {
    const [taken] = await tx.select({ id: users.id }).from(users).where(eq(users.email, account.email));
    if (taken) throw duplicateEmail();
    let teamId: number;
    let role: Role;
    if (account.invitationToken) {
      const invitation = await lockInvitation(tx, account.invitationToken);
      if (invitation.email !== account.email) {
        throw AppError.badRequest('Sign up with the address the invitation was sent to.', [{ field: 'email', message: 'must be the address the invitation was sent to' }]);
      }
      teamId = invitation.teamId;
      role = invitation.role;
      await tx.update(invitations).set({ acceptedAt: new Date() }).where(eq(invitations.id, invitation.id));
    } else {
      const [team] = await tx.insert(teams).values({ name: account.teamName ?? `${account.displayName}'s team` }).returning({ id: teams.id });
      teamId = team!.id;
      role = 'admin';
    }
    const [user] = await tx
      .insert(users)
      .values({ teamId, email: account.email, displayName: account.displayName, passwordHash: account.passwordHash, role })
      .onConflictDoNothing({ target: users.email })
      .returning({ id: users.id });
    // Two sign-ups racing for one address: the second finds the unique index taken.
    if (!user) throw duplicateEmail();
    await recordActivity(tx, { teamId, actorId: user.id, action: 'member.joined', detail: { role } });
    return user.id;
  });
  return (await findUserById(db, id))!;
}

function duplicateEmail(): AppError {
  return new AppError(409, 'duplicate_email', DUPLICATE_EMAIL, [{ field: 'email', message: 'an account with this e-mail already exists' }]);
}

/** Raises the user's session generation: every session opened before ends at its next request. */
export async function endAllSessions(db: Pick<Database, 'update'>, userId: number): Promise<void> {
  await db
    .update(users)
    .set({ sessionGeneration: sql`${users.sessionGeneration} + 1` })
    .where(eq(users.id, userId));
}
