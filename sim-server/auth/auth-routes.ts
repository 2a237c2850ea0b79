import type { NextFunction, Request, Response } from 'express';
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
import { ensureCsrfToken } from './csrf';
import { hashPassword } from './passwords';
import { userOf } from './require-user';
import type { GuardedRouter } from './route-table';
import { endSession, startSession } from './session-start';
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
  signInLimit: number;
  signInWindowMinutes: number;
  /** Sign-ups and password-reset requests allowed per address within signInWindowMinutes. */
  accountRequestLimit: number;
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

export function authRoutes({ route }: GuardedRouter, { passport, db, signInLimit, signInWindowMinutes, accountRequestLimit }: AuthRouteOptions): void {
  const signInLimiter = rateLimit({
    windowMs: signInWindowMinutes * 60_000,
    limit: signInLimit,
    skipSuccessfulRequests: true,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    // Only a string e-mail is keyed: String() of a body object such as {"toString":1} throws.
    keyGenerator: (req) => `${ipKeyGenerator(req.ip ?? '')}|${typeof req.body?.email === 'string' ? req.body.email.trim().toLowerCase() : ''}`,
    handler: limited(`Too many failed sign-in attempts. Try again in ${signInWindowMinutes} minutes.`),
  });
  const accountLimiter = accountRequestLimiter(accountRequestLimit, signInWindowMinutes);

  route('post', '/sign-in', 'public', signInLimiter, (req: Request, res: Response, next: NextFunction) => {
    const parsed = parseWith(signInSchema, req.body);
    if (!parsed.ok) return next(AppError.badRequest('Enter an email and a password.', parsed.errors));
    req.body = parsed.value;
    passport.authenticate('local', (err: unknown, user: AuthUser | false) => {
      if (err) return next(err);
      if (!user) return next(new AppError(401, 'wrong_credentials', WRONG_CREDENTIALS));
      startSession(req, res, user, 200).catch(next);
    })(req, res, next);
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
    await endSession(req);
    res.status(204).end();
  });

  route('post', '/sign-out-everywhere', 'signed-in', async (req, res) => {
    await endAllSessions(db, userOf(req).id);
    await endSession(req);
    res.status(204).end();
  });

  // The app asks /me first thing; the XSRF cookie set here lets its HttpClient send the token.
  route('get', '/me', 'signed-in', (req, res) => {
    ensureCsrfToken(req, res);
    res.json({ user: toSessionUser(userOf(req)) });
  });

  route('get', '/csrf', 'public', (req, res) => {
    const body: CsrfTokenResponse = { csrfToken: ensureCsrfToken(req, res) };
    res.json(body);
  });
}
