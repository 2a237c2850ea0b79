import { createHmac, randomBytes, timingSafeEqual } from 'node:crypto';
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
  setXsrfCookie(req, res, req.session.csrfToken);
  return req.session.csrfToken;
}

/**
 * A token for a visitor who has not signed in, with nothing stored: a random value and its
 * HMAC-SHA256 under the server's secret, sent as the XSRF-TOKEN cookie and in the body (OWASP
 * CSRF Prevention Cheat Sheet, "Signed Double-Submit Cookie"). The HMAC covers a fixed label as
 * well, so no other value the server signs can pass for a token. Pre-session requests (sign-in,
 * sign-up, reset) are still guarded by the Origin check, as before. Storing a session per visitor
 * would let anonymous traffic fill the session table (issue 16 §4); signing in replaces this
 * token with the session's own synchronizer token.
 */
export function anonymousCsrfToken(req: Request, res: Response, secret: string): string {
  const nonce = randomBytes(32).toString('base64url');
  const token = `${nonce}.${anonymousTokenMac(nonce, secret)}`;
  setXsrfCookie(req, res, token);
  return token;
}

function anonymousTokenMac(nonce: string, secret: string): string {
  return createHmac('sha256', secret).update(`kinetwin anonymous csrf token\0${nonce}`, 'utf8').digest('base64url');
}

function setXsrfCookie(req: Request, res: Response, token: string): void {
  // Secure whenever the request itself came over HTTPS, like the session cookie's 'auto'.
  res.cookie(XSRF_COOKIE, token, { httpOnly: false, sameSite: 'strict', secure: req.secure, path: '/' });
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
