import '../shared/luxon-clock';
import { AsyncLocalStorage } from 'node:async_hooks';
import { createHash } from 'node:crypto';
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

/**
 * The forks of one request, made on first use: a request that never touches the ORM (the session,
 * /api/me, static files) does not pay for an entity manager. The shop filter set before the fork
 * exists is applied when it is made.
 */
class LazyForks extends Map<string, EntityManager> {
  private orgId: string | undefined;
  private forking = false;

  constructor(private readonly root: EntityManager) {
    super();
  }

  override get(name: string): EntityManager | undefined {
    let em = super.get(name);
    if (!em && name === this.root.name && !this.forking) {
      // fork() asks the root for its context, which is this map: answer "none" meanwhile, as
      // before RequestContext.create entered its context.
      this.forking = true;
      try {
        em = this.root.fork({ useContext: true });
      } finally {
        this.forking = false;
      }
      super.set(name, em); // before the filter: setFilterParams looks the fork up in this map
      if (this.orgId) em.setFilterParams('org', { orgId: this.orgId });
    }
    return em;
  }

  setShop(orgId: string): void {
    this.orgId = orgId;
    super.get(this.root.name)?.setFilterParams('org', { orgId });
  }
}

// RequestContext.create forks at once and offers no hook; its store is private in the typings.
// Checked here so that an ORM upgrade which moves it fails at start, not on a request.
const contextStorage = (RequestContext as unknown as { storage?: AsyncLocalStorage<RequestContext> }).storage;
if (!(contextStorage instanceof AsyncLocalStorage)) throw new Error('MikroORM RequestContext.storage not found: update withRequestContext()');

/** Runs `next` in a request context whose entity manager is forked from the ORM's on first use. */
export function withRequestContext(orm: MikroORM, next: () => void): void {
  contextStorage!.run(new RequestContext(new LazyForks(orm.em as EntityManager)), next);
}

/** Scopes the request's entity manager to the signed-in shop (the `org` filter). */
export function setRequestShop(orgId: string): void {
  const forks = RequestContext.currentRequestContext()?.map;
  if (!(forks instanceof LazyForks)) throw new Error('No request context: setRequestShop() called outside a request');
  forks.setShop(orgId);
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

const statementNames = new Map<string, string>();

/**
 * executeBound as a named prepared statement: PostgreSQL parses and plans it once per connection
 * (then reuses a generic plan when it costs no more), where planning a join of several tables can
 * cost more than running it. For hot read queries whose text takes few shapes; each distinct text
 * gets its own name.
 */
export async function executePrepared<T = Record<string, unknown>>(em: EntityManager, sql: string, params: unknown[] = []): Promise<T[]> {
  let name = statementNames.get(sql);
  if (!name) {
    name = `kb_${createHash('sha1').update(sql).digest('hex').slice(0, 20)}`;
    statementNames.set(sql, name);
  }
  const knex = (em.getTransactionContext<Knex.Transaction>() ?? em.getConnection().getKnex()) as Knex;
  const result = (await knex.raw(sql, params as Knex.RawBinding[]).options({ name })) as { rows: T[] };
  return result.rows;
}

/** A PostgreSQL array literal for `?::uuid[]` (the driver would expand a JS array into a list). */
export const uuidArray = (ids: string[]) => `{${ids.join(',')}}`;
