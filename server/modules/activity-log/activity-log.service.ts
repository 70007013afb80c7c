import type { EntityManager } from '@mikro-orm/postgresql';
import { ActivityEvent } from './activity-event.entity';
import type { Principal } from '../../http/principal';
import { executeBound } from '../../db';

/** Records who did what to which record, in the caller's unit of work. */
export function recordActivity(
  em: EntityManager,
  who: Pick<Principal, 'orgId'> & { userId: string | null },
  action: string,
  entity: { type: string; id?: string | null },
  details?: Record<string, unknown>,
) {
  return em.create(ActivityEvent, {
    organization: who.orgId,
    actor: who.userId,
    action,
    entityType: entity.type,
    entityId: entity.id ?? null,
    details: details ?? null,
  });
}

export type ActivityRow = { action: string; entityType: string; entityId: string | null; details: Record<string, unknown> | null };

/**
 * Writes many activity-log records of one shop with one statement, at once rather than at flush: for
 * system passes that raise or escalate thousands of work orders (no actor: the system did it).
 */
export async function insertActivityRows(em: EntityManager, orgId: string, rows: ActivityRow[]): Promise<void> {
  if (rows.length === 0) return;
  await executeBound(
    em,
    `insert into audit_event (id, created_at, updated_at, organization_id, actor_id, action, entity_type, entity_id, details)
     select gen_random_uuid(), now(), now(), ?, null, x.action, x.entity_type, x.entity_id, x.details
       from jsonb_to_recordset(?::jsonb) as x(action text, entity_type text, entity_id text, details jsonb)`,
    [orgId, JSON.stringify(rows.map((r) => ({ action: r.action, entity_type: r.entityType, entity_id: r.entityId, details: r.details })))],
  );
}

export type ActivityFilters = { page: number; pageSize: number; action?: string; area?: string; actor?: string; dir: 'asc' | 'desc' };
const AREAS_TTL_MS = 5 * 60_000;
const areasCache = new Map<string, { at: number; areas: string[] }>();

async function areasOf(em: EntityManager, orgId: string): Promise<string[]> {
  const known = areasCache.get(orgId);
  if (known && Date.now() - known.at < AREAS_TTL_MS) return known.areas;
  const rows: { area: string }[] = await em.execute(
    `select distinct split_part(action, '.', 1) as area from audit_event where organization_id = ? order by 1`,
    [orgId],
  );
  const areas = rows.map((r) => r.area);
  if (areasCache.size > 1000) areasCache.clear();
  areasCache.set(orgId, { at: Date.now(), areas });
  return areas;
}

/** One page of the shop's activity log, newest first unless asked otherwise, with what its filters offer. */
export async function listActivity(em: EntityManager, who: Principal, q: ActivityFilters) {
  const where: Record<string, unknown> = {};
  if (q.action) where.action = q.action;
  else if (q.area) where.action = { $like: `${q.area}.%` };
  if (q.actor) where.actor = q.actor === 'system' ? null : q.actor;
  const [rows, total] = await em.findAndCount(ActivityEvent, where, {
    orderBy: [{ createdAt: q.dir }, { id: q.dir }],
    limit: q.pageSize,
    offset: (q.page - 1) * q.pageSize,
    populate: ['actor'],
  });
  // What the filters offer: the areas this shop's log has (read at most every few minutes: it
  // scans the shop's whole log), and its people.
  const areas = await areasOf(em, who.orgId);
  const people: { id: string; name: string }[] = await em.execute(
    `select u.id, u.name from membership m join app_user u on u.id = m.user_id where m.organization_id = ? order by u.name`,
    [who.orgId],
  );
  return {
    rows: rows.map((e) => ({
      id: e.id,
      at: e.createdAt,
      action: e.action,
      entityType: e.entityType,
      entityId: e.entityId,
      actor: e.actor?.isInitialized() ? e.actor.getEntity().name : null,
      details: e.details,
    })),
    total,
    page: q.page,
    pageSize: q.pageSize,
    areas,
    people,
  };
}
