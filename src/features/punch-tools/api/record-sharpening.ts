import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import { api } from '../../../lib/api-client';
import type { sharpeningSchema } from '../../../../shared/schemas/punch-tools';

export const recordSharpening = ({ toolId, ...input }: z.input<typeof sharpeningSchema> & { toolId: string }) =>
  api<{ id: string; hitsSincePrevious: number }>(`/punch-tools/${toolId}/sharpenings`, { method: 'POST', body: input });

export function useRecordSharpening() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: recordSharpening, onSuccess: () => Promise.all([qc.invalidateQueries({ queryKey: ['punch-tools'] }), qc.invalidateQueries({ queryKey: ['stations'] })]) });
}
