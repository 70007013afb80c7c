import type { MikroORM } from '@mikro-orm/postgresql';
import { route, type ApiRouter } from '../../http/route';

export function registerHealthRoutes(r: ApiRouter, orm: MikroORM) {
  route(r, 'get', '/health', { access: 'public' }, async (_req, res) => {
    const started = Date.now();
    try {
      await orm.em.getConnection().execute('select 1');
      res.json({ status: 'ok', database: 'ok', latencyMs: Date.now() - started });
    } catch {
      res.status(503).json({ status: 'degraded', database: 'unreachable' });
    }
  });
}
