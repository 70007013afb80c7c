import { route, type ApiRouter } from '../../http/route';
import { requestEm } from '../../db';
import { requirePrincipal } from '../../http/principal';
import { uuidParam } from '../../../shared/schemas/common';
import { listReadingsQuery, meterInputSchema, meterUpdateSchema, readingBatchSchema, readingInputSchema, trendQuery } from '../../../shared/schemas/machines';
import { addReading, addReadings, createMeter, getMeter, listReadings, meterTrend, updateMeter } from './meters.service';

export function registerMeterRoutes(r: ApiRouter) {
  route(r, 'post', '/meters', { access: 'meters.manage', body: meterInputSchema }, async (req, res) => {
    res.status(201).json(await createMeter(requestEm(), requirePrincipal(req), res.locals.body));
  });
  route(r, 'get', '/meters/:id', { access: 'machines.read', params: uuidParam }, async (_req, res) => {
    res.json(await getMeter(requestEm(), res.locals.params.id));
  });
  route(r, 'patch', '/meters/:id', { access: 'meters.manage', params: uuidParam, body: meterUpdateSchema }, async (req, res) => {
    await updateMeter(requestEm(), requirePrincipal(req), res.locals.params.id, res.locals.body);
    res.json({ ok: true });
  });
  route(r, 'get', '/meters/:id/readings', { access: 'machines.read', params: uuidParam, query: listReadingsQuery }, async (_req, res) => {
    res.json(await listReadings(requestEm(), res.locals.params.id, res.locals.query));
  });
  route(r, 'post', '/meters/:id/readings', { access: 'readings.record', params: uuidParam, body: readingInputSchema }, async (req, res) => {
    res.status(201).json(await addReading(requestEm(), requirePrincipal(req), res.locals.params.id, res.locals.body));
  });
  route(r, 'post', '/meter-readings', { access: 'readings.record', body: readingBatchSchema }, async (req, res) => {
    res.status(201).json(await addReadings(requestEm(), requirePrincipal(req), res.locals.body));
  });
  route(r, 'get', '/meters/:id/trend', { access: 'machines.read', params: uuidParam, query: trendQuery }, async (_req, res) => {
    res.json(await meterTrend(requestEm(), res.locals.params.id, res.locals.query.days));
  });
}
