import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { UsePartInput } from '../../../../shared/schemas/work-orders';
import { queryRoots } from '../../../lib/query-keys';
import { workOrderKeys } from './keys';

export const recordPartUsed = ({ id, ...input }: UsePartInput & { id: string }) =>
  api<{ id: string }>(`/work-orders/${id}/parts`, { method: 'POST', body: input });

/** Records a part taken from stock for a work order (stock goes down). */
export function useRecordPartUsed() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: recordPartUsed,
    onSuccess: () => Promise.all([qc.invalidateQueries({ queryKey: workOrderKeys.all }), qc.invalidateQueries({ queryKey: queryRoots.lookups })]),
  });
}
