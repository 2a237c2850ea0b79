import { Router } from 'express';
import { ipKeyGenerator, rateLimit } from 'express-rate-limit';
import type { PassportStatic } from 'passport';
import { z } from 'zod';
import type { ApiErrorBody } from '../../shared/protocol/api-types';
import { parseWith } from '../../shared/validation/field-errors';
import { AppError } from '../http/app-error';
import { requireUser, userOf } from './require-user';
import { toSessionUser, type AuthUser } from './user-store';

const signInSchema = z.strictObject({
  email: z.string({ error: 'email is required' }).trim().min(1, { error: 'email is required' }).max(254, { error: 'email is too long' }),
  password: z.string({ error: 'password is required' }).min(1, { error: 'password is required' }).max(1024, { error: 'password is too long' }),
});

/** The same words for an unknown e-mail and a wrong password: no hint which part was wrong. */
export const WRONG_CREDENTIALS = 'Email or password is incorrect.';

export interface AuthRouteOptions {
  passport: PassportStatic;
  signInLimit: number;
  signInWindowMinutes: number;
}

export function authRoutes({ passport, signInLimit, signInWindowMinutes }: AuthRouteOptions): Router {
  const router = Router();

  const limiter = rateLimit({
    windowMs: signInWindowMinutes * 60_000,
    limit: signInLimit,
    skipSuccessfulRequests: true,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    keyGenerator: (req) => `${ipKeyGenerator(req.ip ?? '')}|${String(req.body?.email ?? '').trim().toLowerCase()}`,
    handler: (_req, res) => {
      const body: ApiErrorBody = {
        error: { code: 'rate_limited', message: `Too many failed sign-in attempts. Try again in ${signInWindowMinutes} minutes.` },
      };
      res.status(429).json(body);
    },
  });

  router.post('/sign-in', limiter, (req, res, next) => {
    const parsed = parseWith(signInSchema, req.body);
    if (!parsed.ok) return next(AppError.badRequest('Enter an email and a password.', parsed.errors));
    req.body = parsed.value;
    passport.authenticate('local', (err: unknown, user: AuthUser | false) => {
      if (err) return next(err);
      if (!user) return next(new AppError(401, 'wrong_credentials', WRONG_CREDENTIALS));
      // passport 0.6+ regenerates the session id on logIn, so a planted cookie cannot ride along.
      req.logIn(user, (loginErr) => {
        if (loginErr) return next(loginErr);
        res.json({ user: toSessionUser(user) });
      });
    })(req, res, next);
  });

  router.post('/sign-out', (req, res, next) => {
    req.logout((err) => {
      if (err) return next(err);
      req.session.destroy(() => res.status(204).end());
    });
  });

  router.get('/me', requireUser, (req, res) => {
    res.json({ user: toSessionUser(userOf(req)) });
  });

  return router;
}
