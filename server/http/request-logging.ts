import type { Express, RequestHandler } from 'express';
import type { Logger } from 'pino';
import { pinoHttp } from 'pino-http';

const isApi = (url: string | undefined) => !!url?.startsWith('/api');

/**
 * pino-http for the requests whose completion is logged: /api requests while the logger writes
 * `info` (the production default), with the same fields as always. Any other request (static
 * files, or every request under a quieter level) gets `req.log` only when something logs through
 * it: pino-http builds a child logger per request, serializing the request and its headers at
 * once, which a request that logs nothing paid for on every call. That lazy `req.log` is defined
 * once on the app's request prototype rather than on each request (a closure and a property
 * definition per request).
 */
export function requestLogging(app: Express, logger: Logger): RequestHandler {
  const http = pinoHttp({ logger, autoLogging: { ignore: (req) => !isApi(req.url) } });
  const base = http.logger;
  let lastId = 0;
  const own = (req: object, value: unknown) => Object.defineProperty(req, 'log', { configurable: true, enumerable: true, writable: true, value });
  Object.defineProperty(app.request, 'log', {
    configurable: true,
    get(this: Express['request']) {
      this.id ??= lastId = (lastId + 1) & 0x7fffffff;
      const log = base.child({ req: this });
      own(this, log);
      return log;
    },
    set(this: Express['request'], value: unknown) {
      own(this, value);
    },
  });
  return (req, res, next) => {
    if (isApi(req.url) && base.isLevelEnabled('info')) {
      own(req, undefined); // pino-http sets its own logger when `req.log` is unset: not the lazy one above
      return http(req, res, next);
    }
    next();
  };
}
