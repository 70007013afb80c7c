import type { EntityManager } from '@mikro-orm/postgresql';
import { z } from 'zod';
import { route, type ApiRouter } from '../../http/route';
import { requestEm } from '../../db';
import { listActivity } from './activity-log.service';
import { paging } from '../../../shared/schemas/paging';

const query = paging.extend({
  action: z.string().max(80).optional(),
  /** The part of the action before the dot: 'work-order', 'plan', 'user' … */
  area: z
    .string()
    .max(60)
    .regex(/^[a-z0-9-]+$/, { message: 'An area is a word like work-order' })
    .optional(),
  /** A person's id, or 'system' for what the scheduled pass did. */
  actor: z.union([z.literal('system'), z.uuid({ message: 'Not a valid person' })]).optional(),
  dir: z.enum(['asc', 'desc'], { message: 'Direction is asc or desc' }).default('desc'),
});

/** The activity log: who did what to which record (the API path keeps its first name, audit-events). */
export function registerActivityLogRoutes(r: ApiRouter) {
  route(r, 'get', '/audit-events', { access: 'activity-log.read', query }, async (_req, res, { query: q, principal: who }) => {
    res.json(await listActivity(requestEm() as EntityManager, who, q));
  });
}
