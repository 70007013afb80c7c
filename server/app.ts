import '../shared/luxon-clock';
import express, { type Express } from 'express';
import helmet from 'helmet';
import pg from 'pg';
import { existsSync } from 'node:fs';
import path from 'node:path';
import type { MikroORM } from '@mikro-orm/postgresql';
import type { Config } from './config';
import { createApiRouter, type Access, type ApiRouter } from './http/route';
import { createSessionMiddleware, csrfProtection, destroy, principalReadWithSession } from './http/session';
import { errorHandler } from './http/error-handler';
import { requestErrors } from './http/request-errors';
import { notFound } from './http/errors';
import { loadPrincipal, readSessionWithPrincipal } from './modules/auth/auth.service';
import { registerAuthRoutes } from './modules/auth/auth.routes';
import { registerUserRoutes } from './modules/users/users.routes';
import { registerHealthRoutes } from './modules/health/health.routes';
import { registerDevInboxRoutes } from './modules/dev-inbox/dev-inbox.routes';
import { registerActivityLogRoutes } from './modules/activity-log/activity-log.routes';
import { registerOrganizationRoutes } from './modules/organizations/organizations.routes';
import { registerSafetyRoutes } from './modules/safety/safety.routes';
import { registerOutsidePersonnelRoutes } from './modules/safety/outside-personnel.routes';
import { registerMachineRoutes } from './modules/machines/machines.routes';
import { registerMachineStateRoutes } from './modules/machines/machine-state.routes';
import { registerMeterRoutes } from './modules/meters/meters.routes';
import { registerCounterImportRoutes } from './modules/meters/counter-import.routes';
import { registerStockRoutes } from './modules/stock/stock.routes';
import { registerPurchasingRoutes } from './modules/purchasing/purchasing.routes';
import { registerStationRoutes } from './modules/station/station.routes';
import { registerPunchToolRoutes } from './modules/punch-tools/punch-tools.routes';
import { registerPlanRoutes } from './modules/plans/plans.routes';
import { registerWorkOrderRoutes } from './modules/work-orders/work-orders.routes';
import { registerOilAnalysisRoutes } from './modules/oil-analysis/oil-analysis.routes';
import { registerCalendarFeedRoutes } from './modules/calendar-feed/calendar-feed.routes';
import { registerJobRunRoutes } from './modules/job-runs/job-runs.routes';
import { runScheduledPass } from './jobs/scheduler';
import { planEvaluator } from './jobs/due-engine';
import type { FakeSmtp } from './mail/fake-smtp';
import { logger } from './logger';
import { keepPoolAlive } from './db-faults';
import { setRequestShop, withRequestContext } from './db';
import { serveClient } from './http/client-assets';
import type { Principal } from './http/principal';
import { requestLogging } from './http/request-logging';

export type AppDeps = { orm: MikroORM; config: Config; smtp?: FakeSmtp | null };
export type AppHandle = { app: Express; api: ApiRouter; routeAccess: Map<string, Access>; close: () => Promise<void> };

/** Builds the app without listening, so tests can drive it with supertest. */
export function createApp({ orm, config, smtp = null }: AppDeps): AppHandle {
  const app = express();
  // Sessions and the principal of every signed-in request go through this pool; keepPoolAlive: a dropped idle connection must not end the process.
  const pool = keepPoolAlive(new pg.Pool({ connectionString: config.DATABASE_URL, max: 10, connectionTimeoutMillis: 10_000 }), 'sessions');

  if (config.TRUST_PROXY) app.set('trust proxy', /^\d+$/.test(config.TRUST_PROXY) ? Number(config.TRUST_PROXY) : config.TRUST_PROXY);
  app.disable('x-powered-by');
  app.use(
    helmet({
      contentSecurityPolicy: {
        directives: {
          'img-src': ["'self'", 'data:', 'blob:'],
          // Served over plain HTTP on 127.0.0.1 in development; a TLS proxy adds HSTS in production.
          'upgrade-insecure-requests': null,
        },
      },
    }),
  );
  app.use(requestLogging(app, logger));
  const json = express.json({ limit: '1mb' });
  // A GET or HEAD carries no body to read: such requests (most of them) skip the parser's checks.
  app.use((req, res, next) => (req.method === 'GET' || req.method === 'HEAD' ? next() : json(req, res, next)));
  app.use((_req, _res, next) => withRequestContext(orm, next));

  const api = createApiRouter();
  api.use(createSessionMiddleware(config, pool, readSessionWithPrincipal));
  const usePrincipal = (req: express.Request, principal: Principal | null) => {
    if (!principal) return;
    req.principal = principal;
    setRequestShop(principal.orgId);
  };
  // Not an async function: the usual request (principal read with its session) answers at once,
  // without a promise of its own.
  api.use((req, _res, next) => {
    const s = req.session;
    if (!s?.userId || !s.orgId) return next();
    if (s.signedInAt && Date.now() - s.signedInAt > config.SESSION_ABSOLUTE_HOURS * 3600_000) {
      // absolute timeout: sign in again after a shift
      return destroy(req).then(() => next(), next);
    }
    // Read with the session in the same query; asked separately only when it was not (a session of other ids).
    const read = principalReadWithSession(req);
    if (read !== undefined) {
      usePrincipal(req, read);
      return next();
    }
    return loadPrincipal(pool, s.userId, s.orgId).then((principal) => {
      usePrincipal(req, principal);
      next();
    }, next);
  });
  api.use(csrfProtection);

  registerHealthRoutes(api, orm);
  registerAuthRoutes(api, config);
  registerUserRoutes(api, config);
  registerActivityLogRoutes(api);
  registerOrganizationRoutes(api);
  const safety = registerSafetyRoutes(api, config);
  registerOutsidePersonnelRoutes(api, safety.signing);
  registerMachineRoutes(api);
  registerMachineStateRoutes(api, config);
  registerMeterRoutes(api);
  registerCounterImportRoutes(api);
  registerStockRoutes(api);
  registerPurchasingRoutes(api);
  registerStationRoutes(api);
  registerPunchToolRoutes(api);
  registerPlanRoutes(api);
  registerWorkOrderRoutes(api, config);
  registerOilAnalysisRoutes(api, planEvaluator(orm, config.APP_URL));
  registerCalendarFeedRoutes(api, config);
  registerJobRunRoutes(api, (orgId) => runScheduledPass(orm, undefined, { orgId }));
  registerDevInboxRoutes(api, config.MAIL_CAPTURE ? smtp : null, config.NODE_ENV === 'production');

  api.use(() => {
    throw notFound('API route');
  });
  app.use('/api', api);

  const dist = path.resolve(config.CLIENT_DIST);
  if (existsSync(path.join(dist, 'index.html'))) serveClient(app, dist);
  app.use(requestErrors);
  app.use(errorHandler);

  return { app, api, routeAccess: api.routeAccess, close: () => pool.end() };
}
