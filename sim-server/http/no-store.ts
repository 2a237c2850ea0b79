import type { RequestHandler } from 'express';

/**
 * Every API answer carries team data or session state, so no cache (browser, proxy) may keep a
 * copy: `Cache-Control: no-store` (RFC 9111 §5.2.2.5). Set before routing so error answers carry it
 * too; static assets are served outside /api and keep their own caching.
 */
export const noStore: RequestHandler = (_req, res, next) => {
  res.set('Cache-Control', 'no-store');
  next();
};
