import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { CloseWorkOrderInput } from '../../../../shared/schemas/work-orders';
import { queryRoots } from '../../../lib/query-keys';
import { workOrderKeys } from './keys';

export const closeWorkOrder = ({ id, ...input }: CloseWorkOrderInput & { id: string }) =>
  api<{ planNextDueAt: string | null }>(`/work-orders/${id}/close`, { method: 'POST', body: input });

export function useCloseWorkOrder() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: closeWorkOrder,
    onSuccess: () => Promise.all([qc.invalidateQueries({ queryKey: workOrderKeys.all }), qc.invalidateQueries({ queryKey: queryRoots.plans })]),
  });
}
