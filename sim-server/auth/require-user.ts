import type { Request, RequestHandler } from 'express';
import { AppError } from '../http/app-error';
import type { AuthUser } from './user-store';

/** Lets the request through only with a signed-in user. */
export const requireUser: RequestHandler = (req, _res, next) => {
  next(req.user ? undefined : AppError.unauthorized());
};

/** The signed-in user of a request that passed requireUser. */
export function userOf(req: Request): AuthUser {
  if (!req.user) throw AppError.unauthorized();
  return req.user;
}
