import type { Request } from 'express';
import { AppError } from '../http/app-error';
import type { AuthUser } from './user-store';

/** The signed-in user of a request that passed its route guard (route-table.ts). */
export function userOf(req: Request): AuthUser {
  if (!req.user) throw AppError.unauthorized();
  return req.user;
}
