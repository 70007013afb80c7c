import { z } from 'zod';
import { route, type ApiRouter } from '../../http/route';
import { requestEm } from '../../db';
import { requirePrincipal } from '../../http/principal';
import { uuidParam } from '../../../shared/schemas/common';
import { machineInputSchema, machineUpdateSchema } from '../../../shared/schemas/machines';
import { createMachine, getMachine, listMachines, updateMachine } from './machines.service';

const listQuery = z.object({ includeInactive: z.enum(['true', 'false']).optional().transform((v) => v === 'true') });

export function registerMachineRoutes(r: ApiRouter) {
  route(r, 'get', '/machines', { access: 'machines.read', query: listQuery }, async (req, res) => {
    res.json(await listMachines(requestEm(), requirePrincipal(req), res.locals.query));
  });
  route(r, 'post', '/machines', { access: 'machines.manage', body: machineInputSchema }, async (req, res) => {
    res.status(201).json(await createMachine(requestEm(), requirePrincipal(req), res.locals.body));
  });
  route(r, 'get', '/machines/:id', { access: 'machines.read', params: uuidParam }, async (req, res) => {
    res.json(await getMachine(requestEm(), requirePrincipal(req), res.locals.params.id));
  });
  route(r, 'patch', '/machines/:id', { access: 'machines.manage', params: uuidParam, body: machineUpdateSchema }, async (req, res) => {
    await updateMachine(requestEm(), requirePrincipal(req), res.locals.params.id, res.locals.body);
    res.json({ ok: true });
  });
}
