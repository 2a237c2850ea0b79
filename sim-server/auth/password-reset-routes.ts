import { and, eq, isNull, sql } from 'drizzle-orm';
import { passwordResets, users } from '../../drizzle/schema';
import { passwordProblem, passwordResetCompleteSchema, passwordResetRequestSchema } from '../../shared/protocol/library-api';
import type { Database } from '../db/database';
import { AppError } from '../http/app-error';
import { bodyOf } from '../library/request-input';
import { passwordResetMail } from '../mail/mail-templates';
import type { Mailer } from '../mail/mailer';
import { accountRequestLimiter } from './auth-routes';
import { hashLinkToken, newLinkToken } from './link-tokens';
import { hashPassword } from './passwords';
import type { GuardedRouter } from './route-table';
import { endUserSockets } from './session-revocation';
import type { SignInLimits } from './sign-in-limits';
import { startSession } from './session-start';
import { findUserById, findUserWithHashByEmail } from './user-store';

export interface PasswordResetOptions {
  db: Database;
  mailer: Mailer;
  appBaseUrl: () => string;
  ttlMinutes: number;
  accountRequestLimit: number;
  windowMinutes: number;
  /** Completing a reset ends the account's sign-in lockout. */
  signInLimits: SignInLimits;
}

/** The same answer whether or not the address has an account: nothing about accounts leaks. */
export const RESET_REQUESTED = 'If an account uses that address, a link to choose a new password is on its way.';

/** Password reset by an e-mailed single-use link; completing it signs the user out everywhere. */
export function passwordResetRoutes({ route }: GuardedRouter, { db, mailer, appBaseUrl, ttlMinutes, accountRequestLimit, windowMinutes, signInLimits }: PasswordResetOptions): void {
  route('post', '/request', 'public', accountRequestLimiter(accountRequestLimit, windowMinutes), async (req, res) => {
    const { email } = bodyOf(req, passwordResetRequestSchema, 'Enter the e-mail address of your account.');
    const user = await findUserWithHashByEmail(db, email);
    if (user) {
      const { token, hash } = newLinkToken();
      const expiresAt = new Date(Date.now() + ttlMinutes * 60_000);
      await db.insert(passwordResets).values({ userId: user.id, tokenHash: hash, expiresAt });
      await mailer.send(user.email, passwordResetMail({ displayName: user.displayName, url: `${appBaseUrl()}/reset-password?token=${token}`, expiresAt }), user.teamId);
    }
    res.status(202).json({ message: RESET_REQUESTED });
  });

  route('post', '/complete', 'public', async (req, res) => {
    const body = bodyOf(req, passwordResetCompleteSchema, 'The new password is not valid; nothing changed.');
    const { userId, email } = await db.transaction(async (tx) => {
      const [reset] = await tx
        .select({ id: passwordResets.id, userId: passwordResets.userId, expiresAt: passwordResets.expiresAt, usedAt: passwordResets.usedAt, email: users.email, deactivatedAt: users.deactivatedAt })
        .from(passwordResets)
        .innerJoin(users, eq(users.id, passwordResets.userId))
        .where(eq(passwordResets.tokenHash, hashLinkToken(body.token)))
        .for('update', { of: passwordResets });
      if (!reset || reset.deactivatedAt) throw new AppError(400, 'invalid_token', 'This password-reset link is not valid. Ask for a new one.', [{ field: 'token', message: 'not a valid password-reset link' }]);
      if (reset.usedAt) throw new AppError(410, 'token_used', 'This password-reset link has already been used. Ask for a new one.');
      if (reset.expiresAt.getTime() <= Date.now()) throw new AppError(410, 'token_expired', 'This password-reset link has expired. Ask for a new one.');
      // Checked after the link so a weak password does not use the link up.
      const weak = passwordProblem(body.password, reset.email);
      if (weak) throw AppError.badRequest(`The password is too weak: ${weak}.`, [{ field: 'password', message: weak }]);
      await tx
        .update(users)
        .set({ passwordHash: await hashPassword(body.password), sessionGeneration: sql`${users.sessionGeneration} + 1` })
        .where(eq(users.id, reset.userId));
      // Every outstanding link of the user ends with this one.
      await tx
        .update(passwordResets)
        .set({ usedAt: new Date() })
        .where(and(eq(passwordResets.userId, reset.userId), isNull(passwordResets.usedAt)));
      return { userId: reset.userId, email: reset.email };
    });
    endUserSockets(req, userId);
    // The owner proved the mailbox: a lockout an attacker caused ends here.
    await signInLimits.clearAccount(email);
    await startSession(req, res, (await findUserById(db, userId))!, 200);
  });
}
