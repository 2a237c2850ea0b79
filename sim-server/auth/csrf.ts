import { randomBytes, timingSafeEqual } from 'node:crypto';
import type { Request, RequestHandler, Response } from 'express';
import { CSRF_HEADER } from '../../shared/protocol/library-api';
import { AppError } from '../http/app-error';

declare module 'express-session' {
  interface SessionData {
    /** Synchronizer token: every unsafe request of a signed-in session must echo it in a header. */
    csrfToken?: string;
  }
}

/**
 * Cookie Angular's HttpClient reads and echoes as X-XSRF-TOKEN on unsafe requests, so the app
 * needs no code of its own. The server still compares against the session's copy, never the cookie.
 */
export const XSRF_COOKIE = 'XSRF-TOKEN';
const ANGULAR_HEADER = 'x-xsrf-token';

const UNSAFE = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);

/** The session's token, created on first use; also refreshes the XSRF-TOKEN cookie. */
export function ensureCsrfToken(req: Request, res: Response): string {
  req.session.csrfToken ??= randomBytes(32).toString('base64url');
  // Secure whenever the request itself came over HTTPS, like the session cookie's 'auto'.
  res.cookie(XSRF_COOKIE, req.session.csrfToken, { httpOnly: false, sameSite: 'strict', secure: req.secure, path: '/' });
  return req.session.csrfToken;
}

/**
 * Refuses an unsafe request of a signed-in session without the session's token. Requests
 * without a signed-in user pass (the route guard answers 401, or the route is a pre-session one
 * such as sign-in, which the Origin check covers), as do the listed exempt paths.
 */
export function requireCsrfToken(exemptPaths: readonly string[]): RequestHandler {
  const exempt = new Set(exemptPaths);
  return (req, _res, next) => {
    if (!UNSAFE.has(req.method) || !req.user || exempt.has(req.path)) return next();
    const expected = req.session?.csrfToken;
    const sent = req.get(CSRF_HEADER) ?? req.get(ANGULAR_HEADER);
    if (expected && sent && sameText(expected, sent)) return next();
    next(new AppError(403, 'csrf', `This request needs the session's CSRF token in the ${CSRF_HEADER} header (GET /api/auth/csrf gives it).`));
  };
}

function sameText(a: string, b: string): boolean {
  const x = Buffer.from(a);
  const y = Buffer.from(b);
  return x.length === y.length && timingSafeEqual(x, y);
}

/**
 * Refuses an unsafe request a browser sent from another origin. Browsers send Origin on every
 * cross-origin POST (Referer as the fallback); a request with neither is not from a browser
 * page, so there is no victim session to ride and it passes.
 */
export function requireSameOrigin(appBaseUrl: string): RequestHandler {
  const configured = new URL(appBaseUrl).origin;
  return (req, _res, next) => {
    if (!UNSAFE.has(req.method)) return next();
    const claimed = req.get('origin') ?? originOf(req.get('referer'));
    if (claimed === undefined) return next();
    const own = `${req.protocol}://${req.get('host')}`;
    if (claimed === configured || claimed === own) return next();
    next(new AppError(403, 'bad_origin', 'This request came from a page of another site and was refused.'));
  };
}

/**
 * Whether a socket.io handshake may proceed: no Origin (not a browser page), the configured app
 * origin, or a page served by this very host. Keeps pages of other sites from opening live runs
 * with a visitor's cookie.
 */
export function handshakeOriginAllowed(origin: string | undefined, host: string | undefined, appBaseUrl: string): boolean {
  if (origin === undefined) return true;
  if (origin === new URL(appBaseUrl).origin) return true;
  try {
    return host !== undefined && new URL(origin).host === host;
  } catch {
    return false;
  }
}

function originOf(url: string | undefined): string | undefined {
  if (!url) return undefined;
  try {
    return new URL(url).origin;
  } catch {
    return 'invalid';
  }
}
