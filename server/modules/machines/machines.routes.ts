import multer from 'multer';
import { z } from 'zod';
import type { RequestHandler } from 'express';
import { fieldError } from '../../http/errors';
import { route, type ApiRouter } from '../../http/route';
import { requestEm } from '../../db';
import { requirePrincipal } from '../../http/principal';
import { uuidParam } from '../../../shared/schemas/common';
import { machineInputSchema, machinePhotoFields, machinePhotoParams, machineUpdateSchema } from '../../../shared/schemas/machines';
import { MACHINE_PHOTO_MAX_BYTES, addMachinePhoto, deleteMachinePhoto, getMachinePhoto, listMachinePhotos } from './machine-photos.service';
import { createMachine, getMachine, listMachines, updateMachine } from './machines.service';

/** Multipart photo upload (as for procedure photos); multer's own errors become field errors on `photo`. */
const upload: RequestHandler = (req, res, next) => {
  multer({ storage: multer.memoryStorage(), limits: { fileSize: MACHINE_PHOTO_MAX_BYTES, files: 1, fields: 5 } }).single('photo')(req, res, (err: unknown) => {
    if (!err) return next();
    if (err instanceof multer.MulterError) {
      return next(fieldError('photo', err.code === 'LIMIT_FILE_SIZE' ? `The photo is larger than ${MACHINE_PHOTO_MAX_BYTES / 1024 / 1024} MB` : `Upload refused: ${err.message}`));
    }
    next(err);
  });
};

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
