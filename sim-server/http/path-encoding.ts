import type { RequestHandler } from 'express';
import type { RouteRecord } from '../auth/route-table';
import { AppError } from './app-error';

function decodes(segment: string): boolean {
  try {
    decodeURIComponent(segment);
    return true;
  } catch {
    return false;
  }
}

/**
 * The name of the `:param` a raw path would fill at `index`, from the first route of the table
 * whose literal segments match; "path" when no route fits (a malformed literal is still a bad path).
 */
export function paramNameAt(routes: readonly RouteRecord[], segments: readonly string[], index: number): string {
  for (const route of routes) {
    const pattern = route.path.split('/');
    if (pattern.length !== segments.length || !pattern[index]?.startsWith(':')) continue;
    if (pattern.every((part, i) => i === index || part.startsWith(':') || part === segments[i])) return pattern[index]!.slice(1);
  }
  return 'path';
}

/**
 * Refuses a path with malformed percent-encoding (`%`, `%FF`, `%C0%AF`: RFC 3986 §2.1, and UTF-8
 * that is overlong or cut short: RFC 3629 §3) with a 400 naming the parameter, before the router
 * tries to decode it and throws. `routes` is the route table, read at request time because routes
 * are registered after this middleware.
 */
export function refuseMalformedPath(routes: readonly RouteRecord[]): RequestHandler {
  return (req, _res, next) => {
    const segments = `${req.baseUrl}${req.path}`.split('/');
    const index = segments.findIndex((segment) => !decodes(segment));
    if (index < 0) return next();
    const name = paramNameAt(routes, segments, index);
    const message = `${name} is not valid percent-encoded UTF-8 ("${segments[index]!.slice(0, 40)}")`;
    next(AppError.badRequest(`The ${name === 'path' ? 'path' : `path parameter ${name}`} was refused: ${message}.`, [{ field: name, message }]));
  };
}
