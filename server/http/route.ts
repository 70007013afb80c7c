import { Router, type RequestHandler } from 'express';
import { can, type Permission } from '../../shared/permissions';
import { forbidden, unauthorized } from './errors';
import { validate } from './validate';
import type { z } from 'zod';

/**
 * Every API route declares who may call it. `public`: anyone; `signed-in`: any role;
 * otherwise a permission from shared/permissions.ts. The route-permission test walks
 * the router and fails for a route it has no rule for.
 */
export type Access = 'public' | 'signed-in' | Permission;
type Method = 'get' | 'post' | 'put' | 'patch' | 'delete';

export type RouteSpec = {
  access: Access;
  body?: z.ZodType;
  query?: z.ZodType;
  params?: z.ZodType;
  /** Middleware that must run before validation (e.g. rate limits that count bad input too). */
  before?: RequestHandler[];
};

export type ApiRouter = Router & { routeAccess: Map<string, Access> };

export function createApiRouter(): ApiRouter {
  const router = Router() as ApiRouter;
  router.routeAccess = new Map();
  return router;
}

export function guard(access: Access): RequestHandler {
  return (req, _res, next) => {
    if (access === 'public') return next();
    if (!req.principal) return next(unauthorized());
    if (access !== 'signed-in' && !can(req.principal.role, access)) return next(forbidden());
    next();
  };
}

/** Handlers may be async; Express 5 forwards rejected promises to the error handler. */
export function route(router: ApiRouter, method: Method, path: string, spec: RouteSpec, ...handlers: RequestHandler[]) {
  router.routeAccess.set(`${method.toUpperCase()} ${path}`, spec.access);
  router[method](path, guard(spec.access), ...(spec.before ?? []), validate(spec), ...handlers);
}
