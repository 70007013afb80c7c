/**
 * A shop's revision and the pages kept under it. Triggers on every shop table add a row to
 * `shop_change` for each statement that writes the shop's rows (Migration20261205173001); the
 * revision is the sum of the shop's weights, read with one indexed query. It grows with every
 * committed write and with nothing else (a rolled-back write leaves no row, compaction keeps the
 * sum), so a page computed *after* reading revision R is at least as new as R: if the revision
 * still reads R later, nothing the page was computed from has changed since.
 */
import type { EntityManager } from '@mikro-orm/postgresql';
import { executeBound, executePrepared } from '../../db';
import { clock } from '../../../shared/clock';

/** Change rows a shop may gather before a read folds them (the scheduled pass folds them every few minutes too). */
const COMPACT_AFTER_ROWS = 200;
const compacting = new Set<string>();

export async function shopRevision(em: EntityManager, orgId: string): Promise<string> {
  const [row] = await executePrepared<{ revision: string; rows: number }>(
    em,
    `select coalesce(sum(weight), 0)::text as revision, count(*)::int as rows from shop_change where organization_id = ?`,
    [orgId],
  );
  if (row.rows > COMPACT_AFTER_ROWS && !compacting.has(orgId)) {
    // In the background: the revision read above stays right, as compaction keeps the sum.
    compacting.add(orgId);
    void compactShopChanges(em.fork(), orgId)
      .catch(() => undefined) // a failed fold changes nothing; the next read or pass tries again
      .finally(() => compacting.delete(orgId));
  }
  return row.revision;
}

/** Folds each shop's change rows into one of the same total weight, so reading a revision stays a short index scan. */
export async function compactShopChanges(em: EntityManager, orgId?: string): Promise<number> {
  const [row] = await executeBound<{ shops: number }>(
    em,
    `with gone as (delete from shop_change ${orgId ? 'where organization_id = ?' : ''} returning organization_id, weight),
          kept as (insert into shop_change (organization_id, weight) select organization_id, sum(weight) from gone group by organization_id returning 1)
     select count(*)::int as shops from kept`,
    orgId ? [orgId] : [],
  );
  return row.shops;
}

type Entry = { revision: string; computedAt: number; validUntil: number; json: string };

/** How long a kept page may be served at most, for what changes with the time of day alone. */
export const MAX_KEPT_MS = 60_000;
const MAX_ENTRIES = 500;

/**
 * Pages kept per shop and key (e.g. a station's code) while the shop's revision is unchanged, for
 * at most a minute, and no later than the time the page itself says it changes (a due date
 * passing). Each instance keeps its own; all read the same revision, so none serves a stale page.
 * Pages are kept as the JSON sent, so a kept page costs no serialization either.
 */
export class ShopPageCache<T> {
  private readonly entries = new Map<string, Entry>();
  hits = 0;
  misses = 0;

  /**
   * `changesAt`: the times at which the page would read differently with nothing written;
   * `body`: what is sent of the computed value.
   */
  constructor(
    private readonly changesAt: (value: T) => number[] = () => [],
    private readonly body: (value: T) => unknown = (value) => value,
  ) {}

  /** The page's JSON text. */
  async get(em: EntityManager, orgId: string, key: string, compute: () => Promise<T>): Promise<string> {
    const id = `${orgId}:${key}`;
    const revision = await shopRevision(em, orgId);
    const now = clock.ms();
    const hit = this.entries.get(id);
    // A clock moved back (tests, a corrected server clock) is a miss as well.
    if (hit && hit.revision === revision && now >= hit.computedAt && now < hit.validUntil) {
      this.hits++;
      this.entries.delete(id); // most recently used last: the first entry is the one dropped when full
      this.entries.set(id, hit);
      return hit.json;
    }
    this.misses++;
    const value = await compute();
    const validUntil = Math.min(now + MAX_KEPT_MS, ...this.changesAt(value).filter((at) => at > now));
    this.entries.delete(id);
    const json = JSON.stringify(this.body(value));
    this.entries.set(id, { revision, computedAt: now, validUntil, json });
    if (this.entries.size > MAX_ENTRIES) this.entries.delete(this.entries.keys().next().value!);
    return json;
  }
}
