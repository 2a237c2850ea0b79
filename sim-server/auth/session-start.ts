import type { Request, Response } from 'express';
import type { SignedIn } from '../../shared/protocol/library-api';
import { ensureCsrfToken } from './csrf';
import { toSessionUser, type AuthUser } from './user-store';

/**
 * Signs the user into this request's session and answers with the user and a fresh CSRF token.
 * passport 0.6+ regenerates the session id on logIn, so a planted cookie cannot ride along, and
 * the new session gets a token of its own.
 */
export function startSession(req: Request, res: Response, user: AuthUser, status: number): Promise<void> {
  return new Promise((resolve, reject) => {
    req.logIn(user, (err) => {
      if (err) return reject(err);
      const body: SignedIn = { user: toSessionUser(user), csrfToken: ensureCsrfToken(req, res) };
      res.status(status).json(body);
      resolve();
    });
  });
}

/** Ends this request's session (sign-out). */
export function endSession(req: Request): Promise<void> {
  return new Promise((resolve, reject) => {
    req.logout((err) => {
      if (err) return reject(err);
      req.session.destroy(() => resolve());
    });
  });
}
