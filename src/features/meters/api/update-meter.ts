import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import { api } from '../../../lib/api-client';
import type { meterUpdateSchema } from '../../../../shared/schemas/machines';
import { queryRoots } from '../../../lib/query-keys';
import { meterKeys } from './keys';

export const updateMeter = ({ id, ...input }: z.input<typeof meterUpdateSchema> & { id: string }) =>
  api<{ ok: true }>(`/meters/${id}`, { method: 'PATCH', body: input });

export function useUpdateMeter() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: updateMeter,
    onSuccess: () => Promise.all([qc.invalidateQueries({ queryKey: meterKeys.all }), qc.invalidateQueries({ queryKey: queryRoots.machines })]),
  });
}
