import { Router, type Request, type RequestHandler, type Response } from 'express';
import { can, type Permission } from '../../shared/permissions';
import { forbidden, unauthorized } from './errors';
import { idempotency } from './idempotency';
import { parseInput, type ParsedInput, type Schemas } from './validate';
import type { Principal } from './principal';

/**
 * Every API route declares who may call it. `public`: anyone; `signed-in`: any role;
 * otherwise a permission from shared/permissions.ts. The route-permission test walks
 * the router and fails for a route it has no rule for.
 */
export type Access = 'public' | 'signed-in' | Permission;
type Method = 'get' | 'post' | 'put' | 'patch' | 'delete';

export type RouteSpec = Schemas & {
  access: Access;
  /** Middleware that must run before validation (e.g. rate limits that count bad input too). */
  before?: readonly RequestHandler[];
  /** Honour an `Idempotency-Key` header: a retry of the same request gets the first answer and writes nothing (./idempotency.ts). */
  idempotent?: boolean;
};

/** What a handler receives: the parsed body, query and params, and who is calling. */
export type RouteInput<S extends RouteSpec> = ParsedInput<S> & {
  /** Only a public route can be called without signing in. */
  principal: S['access'] extends 'public' ? Principal | undefined : Principal;
};

/** Handlers may be async; Express 5 forwards rejected promises to the error handler. */
export type RouteHandler<S extends RouteSpec> = (req: Request, res: Response, input: RouteInput<S>) => unknown;

/** `idempotentRoutes`: the routes that honour an Idempotency-Key, for the test that checks every signing and station write does. */
export type ApiRouter = Router & { routeAccess: Map<string, Access>; idempotentRoutes: Set<string> };

export function createApiRouter(): ApiRouter {
  const router = Router() as ApiRouter;
  router.routeAccess = new Map();
  router.idempotentRoutes = new Set();
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

function principalFor<S extends RouteSpec>(spec: S, req: Request): RouteInput<S>['principal'] {
  if (spec.access === 'public') return req.principal as RouteInput<S>['principal'];
  // guard() has already refused a request without one; this keeps the type honest.
  if (!req.principal) throw unauthorized();
  return req.principal;
}

/**
 * Registers one route: access check, `before` middleware, validation with the spec's schemas,
 * then the handler with the parsed input typed from those schemas.
 */
export function route<const S extends RouteSpec>(router: ApiRouter, method: Method, path: string, spec: S, handler: RouteHandler<S>) {
  router.routeAccess.set(`${method.toUpperCase()} ${path}`, spec.access);
  if (spec.idempotent) router.idempotentRoutes.add(`${method.toUpperCase()} ${path}`);
  router[method](path, guard(spec.access), ...(spec.before ?? []), ...(spec.idempotent ? [idempotency] : []), async (req, res) => {
    const input: RouteInput<S> = { ...parseInput(spec, req), principal: principalFor(spec, req) };
    await handler(req, res, input);
  });
}
