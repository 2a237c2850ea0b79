import type { RequestHandler } from 'express';
import { findUnsafeText } from '../../shared/validation/unsafe-text';
import { AppError } from './app-error';

/**
 * Applies the one text rule (shared/validation/unsafe-text.ts) to every parsed body and query
 * string, so a NUL or a lone surrogate in any field is a 400 naming the field, never a database
 * error. Registered after body parsing and before every route.
 */
export const refuseUnsafeText: RequestHandler = (req, _res, next) => {
  const inBody = findUnsafeText(req.body);
  if (inBody) return next(AppError.badRequest(`The request body was refused: ${inBody.message}; nothing was changed.`, [inBody]));
  const inQuery = findUnsafeText(req.query);
  if (inQuery) return next(AppError.badRequest(`The query string was refused: ${inQuery.message}.`, [inQuery]));
  next();
};
