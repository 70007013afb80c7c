import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { MachinePhotoRow } from '../../../../shared/schemas/machines';
import { machineKeys } from './keys';

export const machinePhotoUrl = (machineId: string, photoId: string) => `/api/machines/${machineId}/photos/${photoId}`;

export const getMachinePhotos = (machineId: string) => api<MachinePhotoRow[]>(`/machines/${machineId}/photos`);
export const getMachinePhotosQueryOptions = (machineId: string) =>
  queryOptions({ queryKey: machineKeys.photos(machineId), queryFn: () => getMachinePhotos(machineId) });
export const useMachinePhotos = (machineId: string) => useQuery(getMachinePhotosQueryOptions(machineId));

export function useUploadMachinePhoto(machineId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ file, caption }: { file: File; caption?: string }) => {
      const form = new FormData();
      if (caption) form.set('caption', caption);
      form.set('photo', file);
      return api<{ id: string }>(`/machines/${machineId}/photos`, { method: 'POST', body: form });
    },
    onSuccess: () => qc.invalidateQueries({ queryKey: machineKeys.photos(machineId) }),
  });
}

export function useDeleteMachinePhoto(machineId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (photoId: string) => api<{ ok: true }>(`/machines/${machineId}/photos/${photoId}`, { method: 'DELETE' }),
    onSuccess: () => qc.invalidateQueries({ queryKey: machineKeys.photos(machineId) }),
  });
}
