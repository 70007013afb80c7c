import type { EntityManager } from '@mikro-orm/postgresql';
import { z } from 'zod';
import { route, type ApiRouter } from '../../http/route';
import { requestEm } from '../../db';
import { paging } from '../../../shared/schemas/common';
import { AuditEvent } from './audit-event.entity';

const query = paging.extend({ action: z.string().max(80).optional() });

export function registerAuditRoutes(r: ApiRouter) {
  route(r, 'get', '/audit-events', { access: 'audit.read', query }, async (_req, res) => {
    const q = res.locals.query as z.infer<typeof query>;
    const em = requestEm() as EntityManager;
    const [rows, total] = await em.findAndCount(AuditEvent, q.action ? { action: q.action } : {}, {
      orderBy: { createdAt: 'desc' },
      limit: q.pageSize,
      offset: (q.page - 1) * q.pageSize,
      populate: ['actor'],
    });
    res.json({
      rows: rows.map((e) => ({ id: e.id, at: e.createdAt, action: e.action, entityType: e.entityType, entityId: e.entityId, actor: e.actor?.isInitialized() ? e.actor.getEntity().name : null, details: e.details })),
      total,
      page: q.page,
      pageSize: q.pageSize,
    });
  });
}
