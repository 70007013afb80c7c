import '../shared/luxon-clock';
import { MikroORM, RequestContext, type EntityManager, type Knex } from '@mikro-orm/postgresql';
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

/**
 * Runs SQL with its values sent to PostgreSQL as bind parameters ($1, $2 …) instead of inlined into
 * the text, inside the manager's transaction when it has one. `em.execute` escapes and inlines every
 * value, which costs more than the query itself for a multi-megabyte JSON payload (the due engine's
 * batch writes). Placeholders are `?` as with `em.execute`.
 */
export async function executeBound<T = Record<string, unknown>>(em: EntityManager, sql: string, params: unknown[] = []): Promise<T[]> {
  const knex = (em.getTransactionContext<Knex.Transaction>() ?? em.getConnection().getKnex()) as Knex;
  const result = (await knex.raw(sql, params as Knex.RawBinding[])) as { rows: T[] };
  return result.rows;
}

/** A PostgreSQL array literal for `?::uuid[]` (the driver would expand a JS array into a list). */
export const uuidArray = (ids: string[]) => `{${ids.join(',')}}`;
