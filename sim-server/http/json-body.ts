import express, { type Request, type RequestHandler } from 'express';
import { AppError } from './app-error';

/** The one media type API bodies use; body-parser reads exactly this one. */
export const JSON_MEDIA_TYPE = 'application/json';

/**
 * Whether the request carries a body at all (RFC 9112 §6.3: Transfer-Encoding, or a positive
 * Content-Length). A POST with no body or `Content-Length: 0` is fine on routes that take none.
 */
export function hasBody(req: Request): boolean {
  if (req.headers['transfer-encoding'] !== undefined) return true;
  const length = Number(req.headers['content-length'] ?? '0');
  return !Number.isFinite(length) || length > 0;
}

/**
 * Refuses a body that is not JSON with 415 (RFC 9110 §15.5.16) instead of letting the route see
 * no body and act as if it were empty: `curl -d '{}'` sends a form type, and a duplicate or an
 * archive would otherwise go ahead on a body nobody read.
 */
export const requireJsonBody: RequestHandler = requireJsonBodyExcept(() => false);

/** The multipart type of file uploads; only routes that take a file accept it. */
export const MULTIPART_MEDIA_TYPE = 'multipart/form-data';

/**
 * requireJsonBody, except that a request `takesUpload` says is a file upload may be
 * multipart/form-data instead (its route reads it with multer and validates every part).
 */
export function requireJsonBodyExcept(takesUpload: (req: Request) => boolean): RequestHandler {
  return (req, res, next) => {
    if (hasBody(req) && req.is(MULTIPART_MEDIA_TYPE) && takesUpload(req)) return next();
    return jsonOnly(req, res, next);
  };
}

const jsonOnly: RequestHandler = (req, _res, next) => {
  if (!hasBody(req)) return next();
  const sent = req.get('content-type');
  if (!req.is(JSON_MEDIA_TYPE)) {
    return next(new AppError(415, 'unsupported_media_type', `The request body must be ${JSON_MEDIA_TYPE}${sent ? `, not ${sent.slice(0, 80)}` : ' (no Content-Type was sent)'}; nothing was changed.`));
  }
  // body-parser takes any "utf-*" charset, UTF-7 among them (a known filter bypass); JSON between
  // systems is UTF-8 only (RFC 8259 §8.1).
  const charset = charsetOf(sent ?? '');
  if (charset !== null && charset !== 'utf-8' && charset !== 'utf8') {
    return next(new AppError(415, 'unsupported_charset', `The request body's charset ${JSON.stringify(charset.slice(0, 40))} is not accepted; send UTF-8.`));
  }
  next();
};

/** The charset parameter of a Content-Type, lower-cased, or null when there is none (RFC 9110 §8.3.2). */
export function charsetOf(contentType: string): string | null {
  const found = /;\s*charset\s*=\s*(?:"([^"]*)"|([^;\s]*))/i.exec(contentType);
  return found ? (found[1] ?? found[2] ?? '').toLowerCase() : null;
}

/**
 * The API's body parsing: a JSON body or none, at most `limit`, UTF-8 and uncompressed. Content
 * codings are refused (415, mapped in error-handler.ts): the app never compresses what it sends,
 * and inflating costs CPU for a body that is a few kilobytes.
 */
export function jsonBody(limit: string, takesUpload: (req: Request) => boolean = () => false): RequestHandler[] {
  return [requireJsonBodyExcept(takesUpload), express.json({ limit, inflate: false, type: JSON_MEDIA_TYPE })];
}
