import type { EntityManager } from '@mikro-orm/postgresql';
import { fileTypeFromBuffer } from 'file-type';
import { route, type ApiRouter } from '../../http/route';
import { requestEm } from '../../db';
import { requirePrincipal } from '../../http/principal';
import { badRequest } from '../../http/errors';
import { singleFileUpload } from '../../http/upload';
import { uuidParam } from '../../../shared/schemas/common';
import {
  ATTACHMENT_MAX_BYTES,
  ATTACHMENT_TYPES,
  checklistResultsInput,
  closeWorkOrderInput,
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
import { getWorkOrder, listWorkOrders } from './work-orders.queries';
import { addAttachment, getAttachment } from './work-order-attachments.service';
import { getNotifyPreference, setNotifyPreference } from './notify-preference.service';
import { workOrderPdf } from './work-order-pdf';
import { getShopProfile } from '../organizations/organizations.service';
import type { Config } from '../../config';

const attachmentParam = z.object({ id: z.uuid({ message: 'Not a valid id' }), attachmentId: z.uuid({ message: 'Not a valid id' }) });

const upload = singleFileUpload('file', ATTACHMENT_MAX_BYTES);

export function registerWorkOrderRoutes(r: ApiRouter, config: Config) {
  const em = () => requestEm() as EntityManager;
  route(r, 'get', '/work-orders', { access: 'work-orders.read', query: listWorkOrdersQuery }, async (req, res) => {
    res.json(await listWorkOrders(em(), requirePrincipal(req), res.locals.query));
  });
  route(r, 'post', '/work-orders', { access: 'work-orders.raise', body: raiseWorkOrderInput }, async (req, res) => {
    res.status(201).json(await raiseWorkOrder(em(), requirePrincipal(req), res.locals.body, config.APP_URL));
  });
  route(r, 'get', '/work-orders/:id', { access: 'work-orders.read', params: uuidParam }, async (req, res) => {
    res.json(await getWorkOrder(em(), requirePrincipal(req), res.locals.params.id));
  });
  route(r, 'patch', '/work-orders/:id', { access: 'work-orders.work', params: uuidParam, body: updateWorkOrderInput }, async (req, res) => {
    await updateWorkOrder(em(), requirePrincipal(req), res.locals.params.id, res.locals.body);
    res.json({ ok: true });
  });
  route(r, 'post', '/work-orders/:id/move', { access: 'work-orders.work', params: uuidParam, body: moveWorkOrderInput }, async (req, res) => {
    await moveWorkOrder(em(), requirePrincipal(req), res.locals.params.id, res.locals.body);
    res.json({ ok: true });
  });
  route(r, 'put', '/work-orders/:id/checklist', { access: 'work-orders.work', params: uuidParam, body: checklistResultsInput }, async (req, res) => {
    res.json({ checklist: await saveChecklist(em(), requirePrincipal(req), res.locals.params.id, res.locals.body) });
  });
  route(r, 'post', '/work-orders/:id/parts', { access: 'work-orders.work', params: uuidParam, body: usePartInput }, async (req, res) => {
    res.status(201).json(await usePart(em(), requirePrincipal(req), res.locals.params.id, res.locals.body));
  });
  route(r, 'delete', '/work-orders/:id/parts/:lineId', { access: 'work-orders.work', params: partLineParam }, async (req, res) => {
    await returnPart(em(), requirePrincipal(req), res.locals.params.id, res.locals.params.lineId);
    res.json({ ok: true });
  });
  route(r, 'post', '/work-orders/:id/close', { access: 'work-orders.work', params: uuidParam, body: closeWorkOrderInput }, async (req, res) => {
    res.json(await closeWorkOrder(em(), requirePrincipal(req), res.locals.params.id, res.locals.body));
  });
  route(r, 'post', '/work-orders/:id/attachments', { access: 'work-orders.work', params: uuidParam, before: [upload] }, async (req, res) => {
    const file = req.file;
    if (!file) throw badRequest('Choose a photo or PDF to attach', [{ path: 'file', message: 'No file' }]);
    // The content decides, not the name or the browser's claim.
    const kind = await fileTypeFromBuffer(file.buffer);
    if (!kind || !(ATTACHMENT_TYPES as readonly string[]).includes(kind.mime)) {
      throw badRequest('Only photos (JPEG, PNG, WebP) and PDF files can be attached', [{ path: 'file', message: 'Not a photo or PDF' }]);
    }
    res.status(201).json(await addAttachment(em(), requirePrincipal(req), res.locals.params.id, { name: file.originalname, mime: kind.mime, data: file.buffer }));
  });
  route(r, 'get', '/work-orders/:id/attachments/:attachmentId', { access: 'work-orders.read', params: attachmentParam }, async (_req, res) => {
    const a = await getAttachment(em(), res.locals.params.id, res.locals.params.attachmentId);
    res.setHeader('Content-Type', a.mimeType);
    res.setHeader('Content-Disposition', `${a.mimeType.startsWith('image/') ? 'inline' : 'attachment'}; filename="${a.fileName.replace(/"/g, '')}"`);
    res.setHeader('Cache-Control', 'private, max-age=300');
    res.send(a.data);
  });
  route(r, 'get', '/work-orders/:id/pdf', { access: 'work-orders.read', params: uuidParam }, async (req, res) => {
    const who = requirePrincipal(req);
    const wo = await getWorkOrder(em(), who, res.locals.params.id);
    const org = await getShopProfile(em(), who);
    const pdf = await workOrderPdf(wo, { name: org.name, timeZone: org.timeZone });
    res.setHeader('Content-Type', 'application/pdf');
    res.setHeader('Content-Disposition', `inline; filename="WO-${wo.number}.pdf"`);
    res.send(pdf);
  });
  route(r, 'get', '/notify-preference', { access: 'signed-in' }, async (req, res) => {
    res.json(await getNotifyPreference(em(), requirePrincipal(req)));
  });
  route(r, 'put', '/notify-preference', { access: 'signed-in', body: notifyPreferenceInput }, async (req, res) => {
    res.json(await setNotifyPreference(em(), requirePrincipal(req), res.locals.body));
  });
}
