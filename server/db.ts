import { MikroORM, RequestContext, type EntityManager } from '@mikro-orm/postgresql';
import { createOrmConfig } from './mikro-orm.config';

let cached: Promise<MikroORM> | null = null;

/** One ORM per process (tests may pass another database URL on first call). */
export function initORM(databaseUrl?: string): Promise<MikroORM> {
  cached ??= MikroORM.init(createOrmConfig(databaseUrl));
  return cached;
}

export async function closeORM(): Promise<void> {
  if (!cached) return;
  const orm = await cached;
  cached = null;
  await orm.close(true);
}

/** The request's entity manager (RequestContext), carrying the shop filter. */
export function requestEm(): EntityManager {
  const em = RequestContext.getEntityManager();
  if (!em) throw new Error('No request context: requestEm() called outside a request');
  return em as EntityManager;
}
