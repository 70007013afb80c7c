import type { EntityManager } from '@mikro-orm/postgresql';
import { route, type ApiRouter } from '../../http/route';
import { requestEm } from '../../db';
import { requirePrincipal } from '../../http/principal';
import { uuidParam } from '../../../shared/schemas/common';
import { applyStartersInput, listPlansQuery, planInput, starterListQuery } from '../../../shared/schemas/plans';
import { createPlan, updatePlan } from './plans.service';
import { getPlan, listPlans, planLookups } from './plans.queries';
import { applyStarters, listStarters, starterFits } from './plan-starters';

export function registerPlanRoutes(r: ApiRouter) {
  const em = () => requestEm() as EntityManager;
  route(r, 'get', '/plans', { access: 'plans.read', query: listPlansQuery }, async (req, res) => {
    res.json(await listPlans(em(), requirePrincipal(req), res.locals.query));
  });
  route(r, 'post', '/plans', { access: 'plans.manage', body: planInput }, async (req, res) => {
    res.status(201).json(await createPlan(em(), requirePrincipal(req), res.locals.body));
  });
  route(r, 'get', '/plan-lookups', { access: 'plans.read' }, async (req, res) => {
    res.json(await planLookups(em(), requirePrincipal(req)));
  });
  route(r, 'get', '/plans/:id', { access: 'plans.read', params: uuidParam }, async (req, res) => {
    res.json(await getPlan(em(), requirePrincipal(req), res.locals.params.id));
  });
  route(r, 'put', '/plans/:id', { access: 'plans.manage', params: uuidParam, body: planInput }, async (req, res) => {
    await updatePlan(em(), requirePrincipal(req), res.locals.params.id, res.locals.body);
    res.json({ ok: true });
  });
  route(r, 'get', '/plan-starters', { access: 'plans.read', query: starterListQuery }, async (_req, res) => {
    const { machineId } = res.locals.query;
    res.json({ starters: machineId ? await starterFits(em(), machineId) : listStarters() });
  });
  route(r, 'post', '/plan-starters/apply', { access: 'plans.manage', body: applyStartersInput }, async (req, res) => {
    res.status(201).json(await applyStarters(em(), requirePrincipal(req), res.locals.body));
  });
}
