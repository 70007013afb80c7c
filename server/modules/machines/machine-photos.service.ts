import type { EntityManager } from '@mikro-orm/postgresql';
import { fileTypeFromBuffer } from 'file-type';
import { Machine } from './machine.entity';
import { MachinePhoto } from './machine-photo.entity';
import type { Principal } from '../../http/principal';
import { fieldError, notFound } from '../../http/errors';
import { recordActivity } from '../activity-log/activity-log.service';
import { PHOTO_MAX_BYTES, PHOTO_TYPES, megabytes } from '../../../shared/schemas/photos';
import type { MachinePhotoRow } from '../../../shared/schemas/machines';

export const MACHINE_PHOTO_MAX_BYTES = PHOTO_MAX_BYTES;

async function machineOr404(em: EntityManager, id: string) {
  const machine = await em.findOne(Machine, { id });
  if (!machine) throw notFound('Machine');
  return machine;
}

export async function listMachinePhotos(em: EntityManager, machineId: string): Promise<MachinePhotoRow[]> {
  await machineOr404(em, machineId);
  const photos = await em.find(MachinePhoto, { machine: machineId }, { orderBy: { createdAt: 'asc' }, populate: ['uploadedBy'], exclude: ['data'] });
  return photos.map((ph) => ({
    id: ph.id,
    caption: ph.caption ?? null,
    mimeType: ph.mimeType,
    byteSize: ph.byteSize,
    createdAt: ph.createdAt.toISOString(),
    uploadedBy: ph.uploadedBy?.getEntity().name ?? null,
  }));
}

export async function addMachinePhoto(
  em: EntityManager,
  who: Principal,
  machineId: string,
  file: { buffer: Buffer; size: number } | undefined,
  caption: string | null,
) {
  if (!file) throw fieldError('photo', 'Choose a photo to upload');
  if (file.size > MACHINE_PHOTO_MAX_BYTES) throw fieldError('photo', `The photo is larger than ${megabytes(MACHINE_PHOTO_MAX_BYTES)} MB`);
  // Trust the bytes, not the file name or the browser's content type.
  const type = await fileTypeFromBuffer(file.buffer);
  if (!type || !(PHOTO_TYPES as readonly string[]).includes(type.mime)) {
    throw fieldError('photo', `The file is not a JPEG, PNG or WebP image${type ? ` (it looks like ${type.mime})` : ''}`);
  }
  return em.transactional(async (tx) => {
    const machine = await machineOr404(tx, machineId);
    const photo = tx.create(MachinePhoto, {
      organization: who.orgId,
      machine,
      caption,
      mimeType: type.mime,
      byteSize: file.size,
      data: file.buffer,
      uploadedBy: who.userId,
    });
    recordActivity(tx, who, 'machine.photo-added', { type: 'MachinePhoto', id: photo.id }, { machineId, size: file.size });
    return { id: photo.id };
  });
}

export async function getMachinePhoto(em: EntityManager, machineId: string, photoId: string) {
  const photo = await em.findOne(MachinePhoto, { id: photoId, machine: machineId });
  if (!photo) throw notFound('Photo');
  return { mimeType: photo.mimeType, data: photo.data as Buffer };
}

export async function deleteMachinePhoto(em: EntityManager, who: Principal, machineId: string, photoId: string): Promise<void> {
  await em.transactional(async (tx) => {
    const photo = await tx.findOne(MachinePhoto, { id: photoId, machine: machineId });
    if (!photo) throw notFound('Photo');
    recordActivity(tx, who, 'machine.photo-deleted', { type: 'MachinePhoto', id: photoId }, { machineId, caption: photo.caption ?? null });
    tx.remove(photo);
  });
}
