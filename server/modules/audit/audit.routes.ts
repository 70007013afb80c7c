import type { EntityManager } from '@mikro-orm/postgresql';
import { z } from 'zod';
import { route, type ApiRouter } from '../../http/route';
import { requestEm } from '../../db';
import { paging } from '../../../shared/schemas/common';
import { AuditEvent } from './audit-event.entity';

const query = paging.extend({
  action: z.string().max(80).optional(),
  /** The part of the action before the dot: 'work-order', 'plan', 'user' … */
  area: z.string().max(60).regex(/^[a-z0-9-]+$/, { message: 'An area is a word like work-order' }).optional(),
  /** A person's id, or 'system' for what the scheduled pass did. */
  actor: z.union([z.literal('system'), z.uuid({ message: 'Not a valid person' })]).optional(),
  dir: z.enum(['asc', 'desc'], { message: 'Direction is asc or desc' }).default('desc'),
});

const AREAS_TTL_MS = 5 * 60_000;
const areasCache = new Map<string, { at: number; areas: string[] }>();

async function areasOf(em: EntityManager, orgId: string): Promise<string[]> {
  const known = areasCache.get(orgId);
  if (known && Date.now() - known.at < AREAS_TTL_MS) return known.areas;
  const rows: { area: string }[] = await em.execute(`select distinct split_part(action, '.', 1) as area from audit_event where organization_id = ? order by 1`, [orgId]);
  const areas = rows.map((r) => r.area);
  if (areasCache.size > 1000) areasCache.clear();
  areasCache.set(orgId, { at: Date.now(), areas });
  return areas;
}

export function registerAuditRoutes(r: ApiRouter) {
  route(r, 'get', '/audit-events', { access: 'audit.read', query }, async (_req, res, { query: q, principal: who }) => {
    const em = requestEm() as EntityManager;
    const where: Record<string, unknown> = {};
    if (q.action) where.action = q.action;
    else if (q.area) where.action = { $like: `${q.area}.%` };
    if (q.actor) where.actor = q.actor === 'system' ? null : q.actor;
    const [rows, total] = await em.findAndCount(AuditEvent, where, {
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
    res.json({
      rows: rows.map((e) => ({ id: e.id, at: e.createdAt, action: e.action, entityType: e.entityType, entityId: e.entityId, actor: e.actor?.isInitialized() ? e.actor.getEntity().name : null, details: e.details })),
      total,
      page: q.page,
      pageSize: q.pageSize,
      areas,
      people,
    });
  });
}
