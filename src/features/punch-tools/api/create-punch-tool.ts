import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import { api } from '../../../lib/api-client';
import type { punchToolInputSchema } from '../../../../shared/schemas/punch-tools';
import { queryRoots } from '../../../lib/query-keys';
import { punchToolKeys } from './keys';

export const createPunchTool = (input: z.input<typeof punchToolInputSchema>) => api<{ id: string }>('/punch-tools', { method: 'POST', body: input });

export function useCreatePunchTool() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: createPunchTool,
    onSuccess: () => Promise.all([qc.invalidateQueries({ queryKey: punchToolKeys.all }), qc.invalidateQueries({ queryKey: queryRoots.station })]),
  });
}
