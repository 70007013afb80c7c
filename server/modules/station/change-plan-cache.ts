/**
 * The shop-wide change plans on the station page (B10 and the cheapest change point per part
 * type) read every install of each part and fit a Weibull model: most of a station request's
 * time. They change only when what they are computed from changes, so they are kept per shop and
 * part types under a fingerprint of those inputs, read in one small query each request:
 * the installs of those parts, the part types (costs, life unit), the shop's machines (which
 * torch reads which counter) and settings (target reliability), and the counter readings since
 * each part still in a torch went in (its life so far). Row versions (`xmin`) change with every
 * insert and update, counts with every delete, so a fingerprint never matches stale inputs.
 */
import type { EntityManager } from '@mikro-orm/postgresql';
import { executeBound, uuidArray } from '../../db';

const MAX_ENTRIES = 200;
const entries = new Map<string, { fingerprint: string; value: unknown }>();

export async function changePlansFingerprint(em: EntityManager, orgId: string, partTypeIds: string[]): Promise<string> {
  const parts = uuidArray(partTypeIds);
  const [row] = await executeBound<{ fp: string }>(
    em,
    `select concat_ws('|',
        (select count(*) || ':' || coalesce(sum(xmin::text::bigint), 0) from consumable_install where organization_id = ? and part_type_id = any(?::uuid[])),
        (select count(*) || ':' || coalesce(sum(xmin::text::bigint), 0) from part_type where id = any(?::uuid[])),
        (select count(*) || ':' || coalesce(sum(xmin::text::bigint), 0) from machine where organization_id = ?),
        (select xmin::text from organization where id = ?),
        (select count(*) || ':' || coalesce(sum(r.xmin::text::bigint), 0)
           from consumable_install ci join machine t on t.id = ci.torch_id
           join meter m on m.organization_id = ci.organization_id and (m.machine_id = t.id or m.machine_id = t.parent_id)
           join meter_reading r on r.meter_id = m.id and r.read_at > ci.installed_at
          where ci.organization_id = ? and ci.removed_at is null and ci.part_type_id = any(?::uuid[])
            and ((m.kind = 'count' and m.unit = 'starts') or m.kind = 'running-time'))
      ) as fp`,
    [orgId, parts, parts, orgId, orgId, orgId, parts],
  );
  return row.fp;
}

/** The cached value for this shop and part types when its fingerprint still matches, else computes and keeps it. */
export async function cachedChangePlans<T>(em: EntityManager, orgId: string, partTypeIds: string[], compute: () => Promise<T>): Promise<T> {
  const ids = [...new Set(partTypeIds)].sort();
  const key = `${orgId}:${ids.join(',')}`;
  const fingerprint = await changePlansFingerprint(em, orgId, ids);
  const hit = entries.get(key);
  if (hit && hit.fingerprint === fingerprint) {
    // Most recently used last, so the oldest entry is the one dropped when the map is full.
    entries.delete(key);
    entries.set(key, hit);
    return hit.value as T;
  }
  const value = await compute();
  entries.delete(key);
  entries.set(key, { fingerprint, value });
  if (entries.size > MAX_ENTRIES) entries.delete(entries.keys().next().value!);
  return value;
}
