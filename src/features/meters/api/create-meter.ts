import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import { api } from '../../../lib/api-client';
import type { meterInputSchema } from '../../../../shared/schemas/machines';
import { queryRoots } from '../../../lib/query-keys';
import { meterKeys } from './keys';

export const createMeter = (input: z.input<typeof meterInputSchema>) => api<{ id: string }>('/meters', { method: 'POST', body: input });

export function useCreateMeter() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: createMeter,
    onSuccess: () => Promise.all([qc.invalidateQueries({ queryKey: meterKeys.all }), qc.invalidateQueries({ queryKey: queryRoots.machines })]),
  });
}
