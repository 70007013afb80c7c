import type { EntityManager } from '@mikro-orm/postgresql';
import { route, type ApiRouter } from '../../http/route';
import { requestEm } from '../../db';
import { uuidParam } from '../../../shared/schemas/common';
import { DEFAULT_OIL_VERDICT_SETTINGS, listOilAnalysesQuery, oilAnalysisInput, oilTargetInput, oilVerdictSettings } from '../../../shared/schemas/oil-analysis';
import { listAnalyses, listUnits, loadOilSettings, recordAnalysis, saveOilSettings, setTarget } from './oil-analysis.service';
import type { EvaluatePlansNow } from '../plans/plan-evaluation';

export function registerOilAnalysisRoutes(r: ApiRouter, evaluatePlansNow: EvaluatePlansNow) {
  const em = () => requestEm() as EntityManager;
  route(r, 'get', '/oil-units', { access: 'oil.read' }, async (_req, res) => {
    res.json({ units: await listUnits(em()) });
  });
  route(
    r,
    'put',
    '/oil-units/:id/target',
    { access: 'oil.record', params: uuidParam, body: oilTargetInput },
    async (_req, res, { params, body, principal: who }) => {
      res.json(await setTarget(em(), who, params.id, body));
    },
  );
  route(r, 'get', '/oil-settings', { access: 'oil.read' }, async (_req, res, { principal: who }) => {
    res.json({ settings: await loadOilSettings(em(), who.orgId), defaults: DEFAULT_OIL_VERDICT_SETTINGS, source: 'common practice' });
  });
  route(r, 'put', '/oil-settings', { access: 'org.settings.manage', body: oilVerdictSettings }, async (_req, res, { body, principal: who }) => {
    res.json({ settings: await saveOilSettings(em(), who, body) });
  });
  route(r, 'get', '/oil-analyses', { access: 'oil.read', query: listOilAnalysesQuery }, async (_req, res, { query }) => {
    res.json(await listAnalyses(em(), query));
  });
  route(r, 'post', '/oil-analyses', { access: 'oil.record', body: oilAnalysisInput }, async (_req, res, { body, principal: who }) => {
    res.status(201).json(await recordAnalysis(em(), who, body, evaluatePlansNow));
  });
}
