import { z } from 'zod';
import type { RequestHandler } from 'express';
import { route, type ApiRouter } from '../../http/route';
import { requestEm } from '../../db';
import { requirePrincipal } from '../../http/principal';
import { badRequest } from '../../http/errors';
import { singleFileUpload } from '../../http/upload';
import { paging, uuidParam } from '../../../shared/schemas/common';
import { machineCodeParam } from '../../../shared/schemas/machines';
import { PHOTO_MAX_BYTES, consumableChangeSchema, consumableSettingsSchema, cutCheckSchema, lifeStatsQuery } from '../../../shared/schemas/consumables';
import { listCutChecks, recordCutCheck } from './cut-checks.service';
import { lifeStats } from './life-stats.service';
import { Machine } from '../machines/machine.entity';
import { subtreeIds } from '../machines/machines.service';
import { getConsumableSettings, getPhoto, listChanges, logChange, updateConsumableSettings } from './consumables.service';
import { stationView } from '../station/station-view';

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

export function registerConsumableRoutes(r: ApiRouter) {
  route(r, 'get', '/stations/:code', { access: 'machines.read', params: machineCodeParam }, async (req, res) => {
    res.json(await stationView(requestEm(), requirePrincipal(req), res.locals.params.code));
  });
  route(r, 'post', '/consumable-changes', { access: 'consumables.log', before: [receiveChange], body: consumableChangeSchema }, async (req, res) => {
    res.status(201).json(await logChange(requestEm(), requirePrincipal(req), res.locals.body, req.file?.buffer));
  });
  route(r, 'get', '/consumable-changes', { access: 'machines.read', query: changesQuery }, async (_req, res) => {
    const em = requestEm();
    const q = res.locals.query as z.output<typeof changesQuery>;
    let torchIds: string[] | undefined;
    if (q.machineId) {
      const all = await em.find(Machine, {});
      const ids = new Set(subtreeIds(all, q.machineId));
      torchIds = all.filter((m) => ids.has(m.id) && m.kind === 'torch').map((m) => m.id);
    }
    res.json(await listChanges(em, { torchIds, page: q.page, pageSize: q.pageSize }));
  });
  route(r, 'get', '/consumable-changes/:id/photo', { access: 'machines.read', params: uuidParam }, async (_req, res) => {
    const photo = await getPhoto(requestEm(), res.locals.params.id);
    res.type(photo.mimeType).setHeader('Cache-Control', 'private, max-age=3600');
    res.send(photo.data);
  });
  route(r, 'get', '/consumable-life', { access: 'machines.read', query: lifeStatsQuery }, async (req, res) => {
    res.json(await lifeStats(requestEm(), requirePrincipal(req), res.locals.query.partTypeId, res.locals.query.machineId));
  });
  route(r, 'post', '/cut-checks', { access: 'cutchecks.record', body: cutCheckSchema }, async (req, res) => {
    res.status(201).json(await recordCutCheck(requestEm(), requirePrincipal(req), res.locals.body));
  });
  route(r, 'get', '/cut-checks', { access: 'machines.read', query: changesQuery }, async (_req, res) => {
    const em = requestEm();
    const q = res.locals.query as z.output<typeof changesQuery>;
    const all = q.machineId ? await em.find(Machine, {}) : [];
    const ids = q.machineId ? new Set(subtreeIds(all, q.machineId)) : null;
    res.json(await listCutChecks(em, { torchIds: ids ? all.filter((m) => ids.has(m.id)).map((m) => m.id) : undefined, page: q.page, pageSize: q.pageSize }));
  });
  route(r, 'get', '/consumable-settings', { access: 'machines.read' }, async (req, res) => {
    res.json(await getConsumableSettings(requestEm(), requirePrincipal(req)));
  });
  route(r, 'patch', '/consumable-settings', { access: 'org.settings.manage', body: consumableSettingsSchema }, async (req, res) => {
    res.json(await updateConsumableSettings(requestEm(), requirePrincipal(req), res.locals.body));
  });
}
