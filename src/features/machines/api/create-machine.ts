import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import { api } from '../../../lib/api-client';
import type { machineInputSchema } from '../../../../shared/schemas/machines';
import { machineKeys } from './keys';

export const createMachine = (input: z.input<typeof machineInputSchema>) => api<{ id: string }>('/machines', { method: 'POST', body: input });

export function useCreateMachine() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: createMachine, onSuccess: () => qc.invalidateQueries({ queryKey: machineKeys.all }) });
}
