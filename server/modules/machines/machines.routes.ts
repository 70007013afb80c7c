import { z } from 'zod';
import { route, type ApiRouter } from '../../http/route';
import { requestEm } from '../../db';
import { singleFileUpload } from '../../http/upload';
import { uuidParam } from '../../../shared/schemas/common';
import { machineInputSchema, machinePhotoFields, machinePhotoParams, machineUpdateSchema } from '../../../shared/schemas/machines';
import { MACHINE_PHOTO_MAX_BYTES, addMachinePhoto, deleteMachinePhoto, getMachinePhoto, listMachinePhotos } from './machine-photos.service';
import { createMachine, getMachine, listMachines, updateMachine } from './machines.service';

const upload = singleFileUpload('photo', MACHINE_PHOTO_MAX_BYTES, 'photo');

const listQuery = z.object({
  includeInactive: z
    .enum(['true', 'false'])
    .optional()
    .transform((v) => v === 'true'),
});

export function registerMachineRoutes(r: ApiRouter) {
  route(r, 'get', '/machines', { access: 'machines.read', query: listQuery }, async (_req, res, { query, principal: who }) => {
    res.json(await listMachines(requestEm(), who, query));
  });
  route(r, 'post', '/machines', { access: 'machines.manage', body: machineInputSchema }, async (_req, res, { body, principal: who }) => {
    res.status(201).json(await createMachine(requestEm(), who, body));
  });
  route(r, 'get', '/machines/:id', { access: 'machines.read', params: uuidParam }, async (_req, res, { params, principal: who }) => {
    res.json(await getMachine(requestEm(), who, params.id));
  });
  route(
    r,
    'patch',
    '/machines/:id',
    { access: 'machines.manage', params: uuidParam, body: machineUpdateSchema },
    async (_req, res, { params, body, principal: who }) => {
      await updateMachine(requestEm(), who, params.id, body);
      res.json({ ok: true });
    },
  );
  route(r, 'get', '/machines/:id/photos', { access: 'machines.read', params: uuidParam }, async (_req, res, { params }) => {
    res.json(await listMachinePhotos(requestEm(), params.id));
  });
  route(
    r,
    'post',
    '/machines/:id/photos',
    { access: 'machines.manage', params: uuidParam, before: [upload], body: machinePhotoFields },
    async (req, res, { params, body, principal: who }) => {
      res.status(201).json(await addMachinePhoto(requestEm(), who, params.id, req.file, body.caption));
    },
  );
  route(r, 'get', '/machines/:id/photos/:photoId', { access: 'machines.read', params: machinePhotoParams }, async (_req, res, { params }) => {
    const photo = await getMachinePhoto(requestEm(), params.id, params.photoId);
    res.type(photo.mimeType).set('Cache-Control', 'private, max-age=3600').set('X-Content-Type-Options', 'nosniff').send(photo.data);
  });
  route(
    r,
    'delete',
    '/machines/:id/photos/:photoId',
    { access: 'machines.manage', params: machinePhotoParams },
    async (_req, res, { params, principal: who }) => {
      await deleteMachinePhoto(requestEm(), who, params.id, params.photoId);
      res.json({ ok: true });
    },
  );
}
