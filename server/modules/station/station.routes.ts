import { z } from 'zod';
import type { RequestHandler } from 'express';
import { route, type ApiRouter } from '../../http/route';
import { requestEm } from '../../db';
import { badRequest } from '../../http/errors';
import { singleFileUpload } from '../../http/upload';
import { uuidParam } from '../../../shared/schemas/common';
import { machineCodeParam } from '../../../shared/schemas/machines';
import { consumableChangeSchema, consumableSettingsSchema, cutCheckSchema, lifeStatsQuery, type StationView } from '../../../shared/schemas/consumables';
import { listCutChecks, recordCutCheck } from './cut-checks.service';
import { lifeStats } from './life-stats.service';
import { subtreeMachines } from '../machines/machines.service';
import { getConsumableSettings, getPhoto, listChanges, logChange, updateConsumableSettings } from './station.service';
import { stationView } from './station-view';
import { ShopPageCache } from '../shop-changes/shop-revision';
import { ALARM_SHOWN_MS } from './station-status';
import { paging } from '../../../shared/schemas/paging';
import { PHOTO_MAX_BYTES } from '../../../shared/schemas/photos';

const upload = singleFileUpload('photo', PHOTO_MAX_BYTES, 'photo');

/**
 * A change may come as JSON, or as multipart with the fields in a JSON `data` part and an
 * optional `photo` file, so the photo is checked and stored in the same transaction.
 */
const receiveChange: RequestHandler = (req, res, next) => {
  if (!req.is('multipart/form-data')) return next();
  upload(req, res, (err?: unknown) => {
    if (err) return next(err);
    try {
      req.body = JSON.parse(String(req.body?.data ?? '{}'));
    } catch {
      return next(badRequest('The change details are not valid JSON (form field “data”)'));
    }
    next();
  });
};

const changesQuery = paging.extend({ machineId: z.uuid().optional() });

/**
 * Tablets at every machine reload their station page all shift, while the shop's data changes far
 * less often: pages are kept while the shop's revision stands, until an open work order falls due
 * or an alarm leaves the page (a week after it was raised).
 */
export const stationPages = new ShopPageCache<StationView>((page) => [
  ...page.due.flatMap((w) => (w.dueAt && !w.overdue ? [Date.parse(w.dueAt)] : [])),
  ...page.alarms.map((a) => Date.parse(a.at) + ALARM_SHOWN_MS),
]);

/** The station page at the machine: its view, consumable changes with photos, cut checks and consumable lives. */
export function registerStationRoutes(r: ApiRouter) {
  route(r, 'get', '/stations/:code', { access: 'machines.read', params: machineCodeParam }, async (_req, res, { params, principal: who }) => {
    const em = requestEm();
    res.type('json').send(await stationPages.get(em, who.orgId, params.code.toLowerCase(), () => stationView(em, who, params.code)));
  });
  route(
    r,
    'post',
    '/consumable-changes',
    { access: 'consumables.log', before: [receiveChange], body: consumableChangeSchema, idempotent: true },
    async (req, res, { body, principal: who }) => {
      res.status(201).json(await logChange(requestEm(), who, body, req.file?.buffer));
    },
  );
  route(r, 'get', '/consumable-changes', { access: 'machines.read', query: changesQuery }, async (_req, res, { query: q }) => {
    const em = requestEm();
    const torchIds = q.machineId ? (await subtreeMachines(em, q.machineId)).filter((m) => m.kind === 'torch').map((m) => m.id) : undefined;
    res.json(await listChanges(em, { torchIds, page: q.page, pageSize: q.pageSize }));
  });
  route(r, 'get', '/consumable-changes/:id/photo', { access: 'machines.read', params: uuidParam }, async (_req, res, { params }) => {
    const photo = await getPhoto(requestEm(), params.id);
    res.type(photo.mimeType).setHeader('Cache-Control', 'private, max-age=3600');
    res.send(photo.data);
  });
  route(r, 'get', '/consumable-life', { access: 'machines.read', query: lifeStatsQuery }, async (_req, res, { query, principal: who }) => {
    res.json(await lifeStats(requestEm(), who, query.partTypeId, query.machineId));
  });
  route(r, 'post', '/cut-checks', { access: 'cutchecks.record', body: cutCheckSchema, idempotent: true }, async (_req, res, { body, principal: who }) => {
    res.status(201).json(await recordCutCheck(requestEm(), who, body));
  });
  route(r, 'get', '/cut-checks', { access: 'machines.read', query: changesQuery }, async (_req, res, { query: q }) => {
    const em = requestEm();
    const torchIds = q.machineId ? (await subtreeMachines(em, q.machineId)).map((m) => m.id) : undefined;
    res.json(await listCutChecks(em, { torchIds, page: q.page, pageSize: q.pageSize }));
  });
  route(r, 'get', '/consumable-settings', { access: 'machines.read' }, async (_req, res, { principal: who }) => {
    res.json(await getConsumableSettings(requestEm(), who));
  });
  route(r, 'patch', '/consumable-settings', { access: 'org.settings.manage', body: consumableSettingsSchema }, async (_req, res, { body, principal: who }) => {
    res.json(await updateConsumableSettings(requestEm(), who, body));
  });
}
