import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import { api } from '../../../lib/api-client';
import type { sharpeningSchema } from '../../../../shared/schemas/punch-tools';
import { queryRoots } from '../../../lib/query-keys';
import { punchToolKeys } from './keys';

export const recordSharpening = ({ toolId, ...input }: z.input<typeof sharpeningSchema> & { toolId: string }) =>
  api<{ id: string; hitsSincePrevious: number }>(`/punch-tools/${toolId}/sharpenings`, { method: 'POST', body: input });

export function useRecordSharpening() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: recordSharpening,
    onSuccess: () => Promise.all([qc.invalidateQueries({ queryKey: punchToolKeys.all }), qc.invalidateQueries({ queryKey: queryRoots.station })]),
  });
}
