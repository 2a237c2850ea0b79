import type { Request } from 'express';
import type { z } from 'zod';
import { MAX_ID, queryIdField } from '../../shared/protocol/library-api';
import { parseWith } from '../../shared/validation/field-errors';
import { AppError } from '../http/app-error';

/** A numeric path parameter; a malformed one is a 400 naming it, not a 404. */
export function idParam(req: Request, name: string, what: string): number {
  const raw = String(req.params[name] ?? '');
  const parsed = queryIdField(name).safeParse(/^\d+$/.test(raw) ? raw : Number.NaN);
  if (!parsed.success) {
    const message = `"${raw.slice(0, 40)}" is not a ${what} (a positive whole number up to ${MAX_ID}).`;
    throw AppError.badRequest(message, [{ field: name, message }]);
  }
  return parsed.data;
}

/** The request body parsed with a schema, or a 400 with field errors. */
export function bodyOf<S extends z.ZodType>(req: Request, schema: S, summary: string): z.output<S> {
  const parsed = parseWith(schema, req.body ?? {});
  if (!parsed.ok) throw AppError.badRequest(summary, parsed.errors);
  return parsed.value;
}

/** The query string parsed with a schema, or a 400 with field errors. */
export function queryOf<S extends z.ZodType>(req: Request, schema: S): z.output<S> {
  const parsed = parseWith(schema, { ...(req.query as Record<string, unknown>) });
  if (!parsed.ok) throw AppError.badRequest('The query parameters are not valid.', parsed.errors);
  return parsed.value;
}
