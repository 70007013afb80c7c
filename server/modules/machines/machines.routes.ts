import { z } from 'zod';
import { route, type ApiRouter } from '../../http/route';
import { requestEm } from '../../db';
import { requirePrincipal } from '../../http/principal';
import { singleFileUpload } from '../../http/upload';
import { uuidParam } from '../../../shared/schemas/common';
import { machineInputSchema, machinePhotoFields, machinePhotoParams, machineUpdateSchema } from '../../../shared/schemas/machines';
import { MACHINE_PHOTO_MAX_BYTES, addMachinePhoto, deleteMachinePhoto, getMachinePhoto, listMachinePhotos } from './machine-photos.service';
import { createMachine, getMachine, listMachines, updateMachine } from './machines.service';

const upload = singleFileUpload('photo', MACHINE_PHOTO_MAX_BYTES, 'photo');

const listQuery = z.object({ includeInactive: z.enum(['true', 'false']).optional().transform((v) => v === 'true') });

export function registerMachineRoutes(r: ApiRouter) {
  route(r, 'get', '/machines', { access: 'machines.read', query: listQuery }, async (req, res) => {
    res.json(await listMachines(requestEm(), requirePrincipal(req), res.locals.query));
  });
  route(r, 'post', '/machines', { access: 'machines.manage', body: machineInputSchema }, async (req, res) => {
    res.status(201).json(await createMachine(requestEm(), requirePrincipal(req), res.locals.body));
  });
  route(r, 'get', '/machines/:id', { access: 'machines.read', params: uuidParam }, async (req, res) => {
    res.json(await getMachine(requestEm(), requirePrincipal(req), res.locals.params.id));
  });
  route(r, 'patch', '/machines/:id', { access: 'machines.manage', params: uuidParam, body: machineUpdateSchema }, async (req, res) => {
    await updateMachine(requestEm(), requirePrincipal(req), res.locals.params.id, res.locals.body);
    res.json({ ok: true });
  });
  route(r, 'get', '/machines/:id/photos', { access: 'machines.read', params: uuidParam }, async (_req, res) => {
    res.json(await listMachinePhotos(requestEm(), res.locals.params.id));
  });
  route(r, 'post', '/machines/:id/photos', { access: 'machines.manage', params: uuidParam, before: [upload], body: machinePhotoFields }, async (req, res) => {
    res.status(201).json(await addMachinePhoto(requestEm(), requirePrincipal(req), res.locals.params.id, req.file, res.locals.body.caption));
  });
  route(r, 'get', '/machines/:id/photos/:photoId', { access: 'machines.read', params: machinePhotoParams }, async (_req, res) => {
    const photo = await getMachinePhoto(requestEm(), res.locals.params.id, res.locals.params.photoId);
    res.type(photo.mimeType).set('Cache-Control', 'private, max-age=3600').set('X-Content-Type-Options', 'nosniff').send(photo.data);
  });
  route(r, 'delete', '/machines/:id/photos/:photoId', { access: 'machines.manage', params: machinePhotoParams }, async (req, res) => {
    await deleteMachinePhoto(requestEm(), requirePrincipal(req), res.locals.params.id, res.locals.params.photoId);
    res.json({ ok: true });
  });
}
