import type { Request, Response } from 'express';
import { ipKeyGenerator, rateLimit } from 'express-rate-limit';
import type { PassportStatic } from 'passport';
import { z } from 'zod';
import type { ApiErrorBody } from '../../shared/protocol/api-types';
import { invitationLookupSchema, passwordProblem, signUpSchema, type CsrfTokenResponse, type InvitationPreview } from '../../shared/protocol/library-api';
import { parseWith } from '../../shared/validation/field-errors';
import type { Database } from '../db/database';
import { AppError } from '../http/app-error';
import { bodyOf } from '../library/request-input';
import { createAccount, endAllSessions, lockInvitation } from './account-store';
import { anonymousCsrfToken, ensureCsrfToken } from './csrf';
import { hashPassword } from './passwords';
import { userOf } from './require-user';
import type { GuardedRouter } from './route-table';
import { endThisSessionsSockets, endUserSockets } from './session-revocation';
import { endSession, startSession } from './session-start';
import { SignInRefused, type SignInLimits } from './sign-in-limits';
import { toSessionUser, type AuthUser } from './user-store';

const signInSchema = z.strictObject({
  email: z.string({ error: 'email is required' }).trim().min(1, { error: 'email is required' }).max(254, { error: 'email is too long' }),
  password: z.string({ error: 'password is required' }).min(1, { error: 'password is required' }).max(1024, { error: 'password is too long' }),
});

/** The same words for an unknown e-mail and a wrong password: no hint which part was wrong. */
export const WRONG_CREDENTIALS = 'Email or password is incorrect.';

export interface AuthRouteOptions {
  passport: PassportStatic;
  db: Database;
  /** Failed sign-ins per account and per address, kept in PostgreSQL. */
  signInLimits: SignInLimits;
  signInWindowMinutes: number;
  /** Sign-ups and password-reset requests allowed per address within signInWindowMinutes. */
  accountRequestLimit: number;
  /** Signs the CSRF tokens of visitors who have not signed in (the session secret). */
  csrfSecret: string;
}

function limited(message: string) {
  return (_req: Request, res: Response) => {
    const body: ApiErrorBody = { error: { code: 'rate_limited', message } };
    res.status(429).json(body);
  };
}

/** Throttles requests that create accounts or send mail, per address. */
export function accountRequestLimiter(limit: number, windowMinutes: number) {
  return rateLimit({
    windowMs: windowMinutes * 60_000,
    limit,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    keyGenerator: (req) => ipKeyGenerator(req.ip ?? ''),
    handler: limited(`Too many requests of this kind from your address. Try again in ${windowMinutes} minutes.`),
  });
}

/** passport-local's verdict as a promise: the user, or false for a wrong e-mail or password. */
function authenticateLocal(passport: PassportStatic, req: Request, res: Response): Promise<AuthUser | false> {
  return new Promise((resolve, reject) => {
    passport.authenticate('local', (err: unknown, user: AuthUser | false) => (err ? reject(err) : resolve(user)))(req, res, reject);
  });
}

export function authRoutes({ route }: GuardedRouter, { passport, db, signInLimits, signInWindowMinutes, accountRequestLimit, csrfSecret }: AuthRouteOptions): void {
  const accountLimiter = accountRequestLimiter(accountRequestLimit, signInWindowMinutes);

  route('post', '/sign-in', 'public', async (req, res) => {
    const parsed = parseWith(signInSchema, req.body);
    if (!parsed.ok) throw AppError.badRequest('Enter an email and a password.', parsed.errors);
    req.body = parsed.value;
    const { email } = parsed.value;
    // req.ip is the socket's address unless TRUST_PROXY names the proxy it came through.
    const address = req.ip ?? req.socket.remoteAddress ?? '';
    try {
      await signInLimits.begin(address, email);
    } catch (err) {
      if (err instanceof SignInRefused) res.set('Retry-After', String(err.retryAfterSeconds));
      throw err;
    }
    const user = await authenticateLocal(passport, req, res);
    if (!user) throw new AppError(401, 'wrong_credentials', WRONG_CREDENTIALS);
    await signInLimits.succeeded(address, email);
    await startSession(req, res, user, 200);
  });

  route('post', '/sign-up', 'public', accountLimiter, async (req, res) => {
    const body = bodyOf(req, signUpSchema, 'The sign-up is not complete; no account was created.');
    const weak = passwordProblem(body.password, body.email);
    if (weak) throw AppError.badRequest(`The password is too weak: ${weak}.`, [{ field: 'password', message: weak }]);
    const user = await createAccount(db, {
      email: body.email,
      displayName: body.displayName,
      passwordHash: await hashPassword(body.password),
      teamName: body.teamName,
      invitationToken: body.invitationToken,
    });
    await startSession(req, res, user, 201);
  });

  // POST, not GET with the token in the path: request lines end up in logs, bodies do not.
  route('post', '/invitations/lookup', 'public', accountLimiter, async (req, res) => {
    const { token } = bodyOf(req, invitationLookupSchema, 'The invitation link is not valid.');
    const invitation = await lockInvitation(db, token);
    const body: InvitationPreview = { email: invitation.email, teamName: invitation.teamName, role: invitation.role, expiresAt: invitation.expiresAt.toISOString() };
    res.json(body);
  });

  route('post', '/sign-out', 'public', async (req, res) => {
    endThisSessionsSockets(req, res);
    await endSession(req);
    res.status(204).end();
  });

  route('post', '/sign-out-everywhere', 'signed-in', async (req, res) => {
    await endAllSessions(db, userOf(req).id);
    endUserSockets(req, userOf(req).id);
    await endSession(req);
    res.status(204).end();
  });

  // The app asks /me first thing; the XSRF cookie set here lets its HttpClient send the token.
  route('get', '/me', 'signed-in', (req, res) => {
    ensureCsrfToken(req, res);
    res.json({ user: toSessionUser(userOf(req)) });
  });

  // A signed-in session keeps its synchronizer token; a visitor gets one that needs no stored session.
  route('get', '/csrf', 'public', (req, res) => {
    const body: CsrfTokenResponse = { csrfToken: req.user ? ensureCsrfToken(req, res) : anonymousCsrfToken(req, res, csrfSecret) };
    res.json(body);
  });
}
