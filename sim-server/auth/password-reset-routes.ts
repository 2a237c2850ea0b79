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
    const tokenHash = hashLinkToken(body.token);
    // Checked after the link so a weak password does not use the link up.
    const link = usableResetLink(await readResetLink(db, tokenHash, false));
    const weak = passwordProblem(body.password, link.email);
    if (weak) throw AppError.badRequest(`The password is too weak: ${weak}.`, [{ field: 'password', message: weak }]);
    // Hashed before the transaction: a hash may wait behind others, and must not hold a pooled
    // connection and a row lock while it does.
    const passwordHash = await hashPassword(body.password);
    const { userId, email } = await db.transaction(async (tx) => {
      // Read again under the lock: a second use of the same link in the meantime finds it used.
      const reset = usableResetLink(await readResetLink(tx, tokenHash, true));
      await tx
        .update(users)
        .set({ passwordHash, sessionGeneration: sql`${users.sessionGeneration} + 1` })
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

interface ResetLink {
  userId: number;
  email: string;
  expiresAt: Date;
  usedAt: Date | null;
  deactivatedAt: Date | null;
}

type Reader = Pick<Database, 'select'>;

/** The link with this token hash and its account, locked for the transaction when `lock`. */
async function readResetLink(db: Reader, tokenHash: string, lock: boolean): Promise<ResetLink | undefined> {
  const query = db
    .select({ userId: passwordResets.userId, expiresAt: passwordResets.expiresAt, usedAt: passwordResets.usedAt, email: users.email, deactivatedAt: users.deactivatedAt })
    .from(passwordResets)
    .innerJoin(users, eq(users.id, passwordResets.userId))
    .where(eq(passwordResets.tokenHash, tokenHash));
  const [row] = lock ? await query.for('update', { of: passwordResets }) : await query;
  return row;
}

/** The link if it can still be used, else the error that says why not. */
function usableResetLink(reset: ResetLink | undefined): ResetLink {
  if (!reset || reset.deactivatedAt) throw new AppError(400, 'invalid_token', 'This password-reset link is not valid. Ask for a new one.', [{ field: 'token', message: 'not a valid password-reset link' }]);
  if (reset.usedAt) throw new AppError(410, 'token_used', 'This password-reset link has already been used. Ask for a new one.');
  if (reset.expiresAt.getTime() <= Date.now()) throw new AppError(410, 'token_expired', 'This password-reset link has expired. Ask for a new one.');
  return reset;
}
