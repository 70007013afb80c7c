import { route, type ApiRouter } from '../../http/route';
import { requestEm } from '../../db';
import { uuidParam } from '../../../shared/schemas/common';
import { listReadingsQuery, meterInputSchema, meterUpdateSchema, readingBatchSchema, readingInputSchema, trendQuery } from '../../../shared/schemas/machines';
import { addReading, addReadings, createMeter, getMeter, listReadings, meterTrend, updateMeter } from './meters.service';

export function registerMeterRoutes(r: ApiRouter) {
  route(r, 'post', '/meters', { access: 'meters.manage', body: meterInputSchema }, async (_req, res, { body, principal: who }) => {
    res.status(201).json(await createMeter(requestEm(), who, body));
  });
  route(r, 'get', '/meters/:id', { access: 'machines.read', params: uuidParam }, async (_req, res, { params }) => {
    res.json(await getMeter(requestEm(), params.id));
  });
  route(
    r,
    'patch',
    '/meters/:id',
    { access: 'meters.manage', params: uuidParam, body: meterUpdateSchema },
    async (_req, res, { params, body, principal: who }) => {
      await updateMeter(requestEm(), who, params.id, body);
      res.json({ ok: true });
    },
  );
  route(r, 'get', '/meters/:id/readings', { access: 'machines.read', params: uuidParam, query: listReadingsQuery }, async (_req, res, { params, query }) => {
    res.json(await listReadings(requestEm(), params.id, query));
  });
  route(
    r,
    'post',
    '/meters/:id/readings',
    { access: 'readings.record', params: uuidParam, body: readingInputSchema, idempotent: true },
    async (_req, res, { params, body, principal: who }) => {
      res.status(201).json(await addReading(requestEm(), who, params.id, body));
    },
  );
  route(
    r,
    'post',
    '/meter-readings',
    { access: 'readings.record', body: readingBatchSchema, idempotent: true },
    async (_req, res, { body, principal: who }) => {
      res.status(201).json(await addReadings(requestEm(), who, body));
    },
  );
  route(r, 'get', '/meters/:id/trend', { access: 'machines.read', params: uuidParam, query: trendQuery }, async (_req, res, { params, query }) => {
    res.json(await meterTrend(requestEm(), params.id, query.days));
  });
}
