import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import { api } from '../../../lib/api-client';
import type { machineUpdateSchema } from '../../../../shared/schemas/machines';
import { machineKeys } from './keys';

export const updateMachine = ({ id, ...input }: z.input<typeof machineUpdateSchema> & { id: string }) =>
  api<{ ok: true }>(`/machines/${id}`, { method: 'PATCH', body: input });

export function useUpdateMachine() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: updateMachine, onSuccess: () => qc.invalidateQueries({ queryKey: machineKeys.all }) });
}
