import { z } from 'zod';
import { route, type ApiRouter } from '../../http/route';
import { requestEm } from '../../db';
import { requirePrincipal } from '../../http/principal';
import { uuidParam } from '../../../shared/schemas/common';
import { punchToolInputSchema, punchToolUpdateSchema, sharpeningSchema } from '../../../shared/schemas/punch-tools';
import { createTool, listSharpenings, listTools, recordSharpening, updateTool } from './punch-tools.service';
import { subtreeMachines } from '../machines/machines.service';

const listQuery = z.object({ machineId: z.uuid().optional(), includeInactive: z.enum(['true', 'false']).optional().transform((v) => v === 'true') });

export function registerPunchToolRoutes(r: ApiRouter) {
  route(r, 'get', '/punch-tools', { access: 'machines.read', query: listQuery }, async (_req, res) => {
    const q = res.locals.query as z.output<typeof listQuery>;
    const em = requestEm();
    // A machine's tools include those on its components (a cell's punch head).
    const machineIds = q.machineId ? (await subtreeMachines(em, q.machineId)).map((m) => m.id) : undefined;
    res.json(await listTools(em, { machineIds, includeInactive: q.includeInactive }));
  });
  route(r, 'post', '/punch-tools', { access: 'tools.manage', body: punchToolInputSchema }, async (req, res) => {
    res.status(201).json(await createTool(requestEm(), requirePrincipal(req), res.locals.body));
  });
  route(r, 'patch', '/punch-tools/:id', { access: 'tools.manage', params: uuidParam, body: punchToolUpdateSchema }, async (req, res) => {
    await updateTool(requestEm(), requirePrincipal(req), res.locals.params.id, res.locals.body);
    res.json({ ok: true });
  });
  route(r, 'get', '/punch-tools/:id/sharpenings', { access: 'machines.read', params: uuidParam }, async (_req, res) => {
    res.json(await listSharpenings(requestEm(), res.locals.params.id));
  });
  route(r, 'post', '/punch-tools/:id/sharpenings', { access: 'tools.manage', params: uuidParam, body: sharpeningSchema }, async (req, res) => {
    res.status(201).json(await recordSharpening(requestEm(), requirePrincipal(req), res.locals.params.id, res.locals.body));
  });
}
