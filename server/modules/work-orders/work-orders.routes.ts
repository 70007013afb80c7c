import type { EntityManager } from '@mikro-orm/postgresql';
import { fileTypeFromBuffer } from 'file-type';
import { route, type ApiRouter } from '../../http/route';
import { requestEm } from '../../db';
import { badRequest } from '../../http/errors';
import { singleFileUpload } from '../../http/upload';
import { uuidParam } from '../../../shared/schemas/common';
import {
  ATTACHMENT_MAX_BYTES,
  ATTACHMENT_TYPES,
  checklistKeyParam,
  checklistResultsInput,
  closeWorkOrderInput,
  deviationInput,
  listWorkOrdersQuery,
  moveWorkOrderInput,
  notifyPreferenceInput,
  partLineParam,
  raiseWorkOrderInput,
  updateWorkOrderInput,
  usePartInput,
} from '../../../shared/schemas/work-orders';
import { z } from 'zod';
import { closeWorkOrder, moveWorkOrder, raiseWorkOrder, returnPart, saveChecklist, updateWorkOrder, usePart } from './work-orders.service';
import { getWorkOrder, listWorkOrders, nextDueStateChangeInMs } from './work-orders.queries';
import { ShopPageCache } from '../shop-changes/shop-revision';
import { clock } from '../../../shared/clock';
import type { Page } from '../../../shared/schemas/paging';
import type { WorkOrderRow } from '../../../shared/schemas/work-orders';
import { acceptDeviation, raiseRepairForFailedCheck } from './failed-checks';
import { confirmSignature } from '../safety/chain';
import { addAttachment, getAttachment } from './work-order-attachments.service';
import { getNotifyPreference, setNotifyPreference } from './notify-preference.service';
import { workOrderPdf } from './work-order-pdf';
import { getShopProfile } from '../organizations/organizations.service';
import type { Config } from '../../config';

const attachmentParam = z.object({ id: z.uuid({ message: 'Not a valid id' }), attachmentId: z.uuid({ message: 'Not a valid id' }) });

const upload = singleFileUpload('file', ATTACHMENT_MAX_BYTES);

/**
 * Work-order lists kept per person and query while the shop's revision stands, for at most a
 * minute and no later than the next moment a work order's due state changes by the clock alone.
 */
export const workOrderLists = new ShopPageCache<{ page: Page<WorkOrderRow>; changeAt: number | null }>(
  (kept) => (kept.changeAt === null ? [] : [kept.changeAt]),
  (kept) => kept.page,
);

export function registerWorkOrderRoutes(r: ApiRouter, config: Config) {
  const em = () => requestEm() as EntityManager;
  route(r, 'get', '/work-orders', { access: 'work-orders.read', query: listWorkOrdersQuery }, async (_req, res, { query, principal: who }) => {
    const key = `${who.userId}:${who.role}:${JSON.stringify(query)}`;
    const list = await workOrderLists.get(em(), who.orgId, key, async () => {
      const inMs = await nextDueStateChangeInMs(em(), who.orgId);
      return { page: await listWorkOrders(em(), who, query), changeAt: inMs === null ? null : clock.ms() + inMs };
    });
    res.type('json').send(list);
  });
  route(r, 'post', '/work-orders', { access: 'work-orders.raise', body: raiseWorkOrderInput }, async (_req, res, { body, principal: who }) => {
    res.status(201).json(await raiseWorkOrder(em(), who, body, config.APP_URL));
  });
  route(r, 'get', '/work-orders/:id', { access: 'work-orders.read', params: uuidParam }, async (_req, res, { params, principal: who }) => {
    res.json(await getWorkOrder(em(), who, params.id));
  });
  route(
    r,
    'patch',
    '/work-orders/:id',
    { access: 'work-orders.work', params: uuidParam, body: updateWorkOrderInput },
    async (_req, res, { params, body, principal: who }) => {
      await updateWorkOrder(em(), who, params.id, body, config.APP_URL);
      res.json({ ok: true });
    },
  );
  route(
    r,
    'post',
    '/work-orders/:id/move',
    { access: 'work-orders.work', params: uuidParam, body: moveWorkOrderInput },
    async (_req, res, { params, body, principal: who }) => {
      await moveWorkOrder(em(), who, params.id, body);
      res.json({ ok: true });
    },
  );
  route(
    r,
    'put',
    '/work-orders/:id/checklist',
    { access: 'work-orders.work', params: uuidParam, body: checklistResultsInput },
    async (_req, res, { params, body, principal: who }) => {
      res.json({ checklist: await saveChecklist(em(), who, params.id, body) });
    },
  );
  route(
    r,
    'post',
    '/work-orders/:id/parts',
    { access: 'work-orders.work', params: uuidParam, body: usePartInput },
    async (_req, res, { params, body, principal: who }) => {
      res.status(201).json(await usePart(em(), who, params.id, body));
    },
  );
  route(r, 'delete', '/work-orders/:id/parts/:lineId', { access: 'work-orders.work', params: partLineParam }, async (_req, res, { params, principal: who }) => {
    await returnPart(em(), who, params.id, params.lineId);
    res.json({ ok: true });
  });
  // A failed safety-critical check: repair work (machine out of service until it is done), or a signed deviation.
  route(
    r,
    'post',
    '/work-orders/:id/checklist/:key/repair',
    { access: 'work-orders.work', params: checklistKeyParam },
    async (_req, res, { params, principal: who }) => {
      res.status(201).json(await raiseRepairForFailedCheck(em(), who, params.id, params.key, config.APP_URL));
    },
  );
  route(
    r,
    'post',
    '/work-orders/:id/checklist/:key/deviation',
    { access: 'safety.deviation.sign', params: checklistKeyParam, body: deviationInput },
    async (_req, res, { params, body, principal: who }) => {
      // The password first, as at every signature: a wrong one writes nothing.
      await confirmSignature(em(), who, body.password);
      res.status(201).json(await acceptDeviation(em(), who, params.id, params.key, body));
    },
  );
  route(
    r,
    'post',
    '/work-orders/:id/close',
    { access: 'work-orders.work', params: uuidParam, body: closeWorkOrderInput },
    async (_req, res, { params, body, principal: who }) => {
      res.json(await closeWorkOrder(em(), who, params.id, body));
    },
  );
  route(
    r,
    'post',
    '/work-orders/:id/attachments',
    { access: 'work-orders.work', params: uuidParam, before: [upload] },
    async (req, res, { params, principal: who }) => {
      const file = req.file;
      if (!file) throw badRequest('Choose a photo or PDF to attach', [{ path: 'file', message: 'No file' }]);
      // The content decides, not the name or the browser's claim.
      const kind = await fileTypeFromBuffer(file.buffer);
      if (!kind || !(ATTACHMENT_TYPES as readonly string[]).includes(kind.mime)) {
        throw badRequest('Only photos (JPEG, PNG, WebP) and PDF files can be attached', [{ path: 'file', message: 'Not a photo or PDF' }]);
      }
      res.status(201).json(await addAttachment(em(), who, params.id, { name: file.originalname, mime: kind.mime, data: file.buffer }));
    },
  );
  route(r, 'get', '/work-orders/:id/attachments/:attachmentId', { access: 'work-orders.read', params: attachmentParam }, async (_req, res, { params }) => {
    const a = await getAttachment(em(), params.id, params.attachmentId);
    res.setHeader('Content-Type', a.mimeType);
    res.setHeader('Content-Disposition', `${a.mimeType.startsWith('image/') ? 'inline' : 'attachment'}; filename="${a.fileName.replace(/"/g, '')}"`);
    res.setHeader('Cache-Control', 'private, max-age=300');
    res.send(a.data);
  });
  route(r, 'get', '/work-orders/:id/pdf', { access: 'work-orders.read', params: uuidParam }, async (_req, res, { params, principal: who }) => {
    const wo = await getWorkOrder(em(), who, params.id);
    const org = await getShopProfile(em(), who);
    const pdf = await workOrderPdf(wo, { name: org.name, timeZone: who.timeZone, locale: who.locale });
    res.setHeader('Content-Type', 'application/pdf');
    res.setHeader('Content-Disposition', `inline; filename="WO-${wo.number}.pdf"`);
    res.send(pdf);
  });
  route(r, 'get', '/notify-preference', { access: 'signed-in' }, async (_req, res, { principal: who }) => {
    res.json(await getNotifyPreference(em(), who));
  });
  route(r, 'put', '/notify-preference', { access: 'signed-in', body: notifyPreferenceInput }, async (_req, res, { body, principal: who }) => {
    res.json(await setNotifyPreference(em(), who, body));
  });
}
