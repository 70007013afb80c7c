import type { RequestHandler } from 'express';
import type { Logger } from 'pino';
import { pinoHttp } from 'pino-http';

const isApi = (url: string | undefined) => !!url?.startsWith('/api');

/**
 * pino-http for the requests whose completion is logged: /api requests while the logger writes
 * `info` (the production default), with the same fields as always. Any other request (static
 * files, or every request under a quieter level) gets `req.log` only when something logs through
 * it: pino-http builds a child logger per request, serializing the request and its headers at
 * once, which a request that logs nothing paid for on every call.
 */
export function requestLogging(logger: Logger): RequestHandler {
  const http = pinoHttp({ logger, autoLogging: { ignore: (req) => !isApi(req.url) } });
  const base = http.logger;
  let lastId = 0;
  return (req, res, next) => {
    if (isApi(req.url) && base.isLevelEnabled('info')) return http(req, res, next);
    Object.defineProperty(req, 'log', {
      configurable: true,
      enumerable: true,
      get() {
        req.id ??= lastId = (lastId + 1) & 0x7fffffff;
        const log = base.child({ req });
        Object.defineProperty(req, 'log', { configurable: true, enumerable: true, writable: true, value: log });
        return log;
      },
    });
    next();
  };
}
