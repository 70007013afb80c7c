import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import { api } from '../../../lib/api-client';
import type { partTypeInputSchema } from '../../../../shared/schemas/stock';
import { stockKeys } from './keys';

export const createPartType = (input: z.input<typeof partTypeInputSchema>) => api<{ id: string }>('/part-types', { method: 'POST', body: input });

export function useCreatePartType() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: createPartType, onSuccess: () => qc.invalidateQueries({ queryKey: stockKeys.all }) });
}
