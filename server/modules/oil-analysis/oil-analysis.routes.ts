import type { EntityManager } from '@mikro-orm/postgresql';
import { route, type ApiRouter } from '../../http/route';
import { requestEm } from '../../db';
import { requirePrincipal } from '../../http/principal';
import { uuidParam } from '../../../shared/schemas/common';
import { listOilAnalysesQuery, oilAnalysisInput, oilTargetInput } from '../../../shared/schemas/oil-analysis';
import { listAnalyses, listUnits, recordAnalysis, setTarget } from './oil-analysis.service';
import type { EvaluatePlansNow } from '../plans/plan-evaluation';

export function registerOilAnalysisRoutes(r: ApiRouter, evaluatePlansNow: EvaluatePlansNow) {
  const em = () => requestEm() as EntityManager;
  route(r, 'get', '/oil-units', { access: 'oil.read' }, async (_req, res) => {
    res.json({ units: await listUnits(em()) });
  });
  route(r, 'put', '/oil-units/:id/target', { access: 'oil.record', params: uuidParam, body: oilTargetInput }, async (req, res) => {
    res.json(await setTarget(em(), requirePrincipal(req), res.locals.params.id, res.locals.body));
  });
  route(r, 'get', '/oil-analyses', { access: 'oil.read', query: listOilAnalysesQuery }, async (_req, res) => {
    res.json(await listAnalyses(em(), res.locals.query));
  });
  route(r, 'post', '/oil-analyses', { access: 'oil.record', body: oilAnalysisInput }, async (req, res) => {
    res.status(201).json(await recordAnalysis(em(), requirePrincipal(req), res.locals.body, evaluatePlansNow));
  });
}
