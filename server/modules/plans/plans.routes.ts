import type { EntityManager } from '@mikro-orm/postgresql';
import { route, type ApiRouter } from '../../http/route';
import { requestEm } from '../../db';
import { uuidParam } from '../../../shared/schemas/common';
import { applyStartersInput, listPlansQuery, planInput, starterListQuery } from '../../../shared/schemas/plans';
import { createPlan, updatePlan } from './plans.service';
import { getPlan, listPlans, planLookups } from './plans.queries';
import { applyStarters, listStarters, starterFits } from './plan-starters';

export function registerPlanRoutes(r: ApiRouter) {
  const em = () => requestEm() as EntityManager;
  route(r, 'get', '/plans', { access: 'plans.read', query: listPlansQuery }, async (_req, res, { query, principal: who }) => {
    res.json(await listPlans(em(), who, query));
  });
  route(r, 'post', '/plans', { access: 'plans.manage', body: planInput }, async (_req, res, { body, principal: who }) => {
    res.status(201).json(await createPlan(em(), who, body));
  });
  route(r, 'get', '/plan-lookups', { access: 'plans.read' }, async (_req, res, { principal: who }) => {
    res.json(await planLookups(em(), who));
  });
  route(r, 'get', '/plans/:id', { access: 'plans.read', params: uuidParam }, async (_req, res, { params, principal: who }) => {
    res.json(await getPlan(em(), who, params.id));
  });
  route(r, 'put', '/plans/:id', { access: 'plans.manage', params: uuidParam, body: planInput }, async (_req, res, { params, body, principal: who }) => {
    await updatePlan(em(), who, params.id, body);
    res.json({ ok: true });
  });
  route(r, 'get', '/plan-starters', { access: 'plans.read', query: starterListQuery }, async (_req, res, { query }) => {
    const { machineId } = query;
    res.json({ starters: machineId ? await starterFits(em(), machineId) : listStarters() });
  });
  route(r, 'post', '/plan-starters/apply', { access: 'plans.manage', body: applyStartersInput }, async (_req, res, { body, principal: who }) => {
    res.status(201).json(await applyStarters(em(), who, body));
  });
}
