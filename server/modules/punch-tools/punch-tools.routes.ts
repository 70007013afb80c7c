import { z } from 'zod';
import { route, type ApiRouter } from '../../http/route';
import { requestEm } from '../../db';
import { uuidParam } from '../../../shared/schemas/common';
import { punchToolInputSchema, punchToolUpdateSchema, sharpeningSchema } from '../../../shared/schemas/punch-tools';
import { createTool, listSharpenings, listTools, recordSharpening, updateTool } from './punch-tools.service';
import { subtreeMachines } from '../machines/machines.service';

const listQuery = z.object({
  machineId: z.uuid().optional(),
  includeInactive: z
    .enum(['true', 'false'])
    .optional()
    .transform((v) => v === 'true'),
});

export function registerPunchToolRoutes(r: ApiRouter) {
  route(r, 'get', '/punch-tools', { access: 'machines.read', query: listQuery }, async (_req, res, { query }) => {
    const q = query;
    const em = requestEm();
    // A machine's tools include those on its components (a cell's punch head).
    const machineIds = q.machineId ? (await subtreeMachines(em, q.machineId)).map((m) => m.id) : undefined;
    res.json(await listTools(em, { machineIds, includeInactive: q.includeInactive }));
  });
  route(r, 'post', '/punch-tools', { access: 'tools.manage', body: punchToolInputSchema }, async (_req, res, { body, principal: who }) => {
    res.status(201).json(await createTool(requestEm(), who, body));
  });
  route(
    r,
    'patch',
    '/punch-tools/:id',
    { access: 'tools.manage', params: uuidParam, body: punchToolUpdateSchema },
    async (_req, res, { params, body, principal: who }) => {
      await updateTool(requestEm(), who, params.id, body);
      res.json({ ok: true });
    },
  );
  route(r, 'get', '/punch-tools/:id/sharpenings', { access: 'machines.read', params: uuidParam }, async (_req, res, { params }) => {
    res.json(await listSharpenings(requestEm(), params.id));
  });
  route(
    r,
    'post',
    '/punch-tools/:id/sharpenings',
    { access: 'tools.manage', params: uuidParam, body: sharpeningSchema },
    async (_req, res, { params, body, principal: who }) => {
      res.status(201).json(await recordSharpening(requestEm(), who, params.id, body));
    },
  );
}
