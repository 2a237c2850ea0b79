import { Router, type RequestHandler } from 'express';
import { AppError } from '../http/app-error';
import { ACTION_WORDS, roleMay, type RouteAccess } from './permissions';

export type RouteMethod = 'get' | 'post' | 'put' | 'patch' | 'delete';

/** One API route and who may call it; the role-matrix test walks every record. */
export interface RouteRecord {
  method: RouteMethod;
  /** Full path as Express matches it, e.g. "/api/scenarios/:id/revisions/:n/sign-off". */
  path: string;
  access: RouteAccess;
}

/** Guards a route: 401 without a signed-in user, 403 when the role may not take the action. */
export function requireAccess(access: RouteAccess): RequestHandler {
  return (req, _res, next) => {
    if (access === 'public') return next();
    if (!req.user) return next(AppError.unauthorized());
    if (access === 'signed-in' || roleMay(req.user.role, access)) return next();
    next(new AppError(403, 'forbidden_role', `Your role (${req.user.role}) may not ${ACTION_WORDS[access]}.`));
  };
}

/** A router whose every route declares its access, guarded and recorded in one place. */
export interface GuardedRouter {
  router: Router;
  route(method: RouteMethod, path: string, access: RouteAccess, ...handlers: RequestHandler[]): void;
}

/** Every guarded route of the app, in registration order. */
export class RouteTable {
  readonly routes: RouteRecord[] = [];

  /** A router to mount at `prefix` (the full /api path), recording each route it gets. */
  under(prefix: string): GuardedRouter {
    const router = Router();
    return {
      router,
      route: (method, path, access, ...handlers) => {
        this.routes.push({ method, path: `${prefix}${path === '/' ? '' : path}`, access });
        router[method](path, requireAccess(access), ...handlers);
      },
    };
  }
}
