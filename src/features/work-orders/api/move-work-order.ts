import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { MoveWorkOrderInput } from '../../../../shared/schemas/work-orders';
import { queryRoots } from '../../../lib/query-keys';
import { workOrderKeys } from './keys';

export const moveWorkOrder = ({ id, ...input }: MoveWorkOrderInput & { id: string }) =>
  api<{ ok: true }>(`/work-orders/${id}/move`, { method: 'POST', body: input });

export function useMoveWorkOrder() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: moveWorkOrder,
    onSuccess: () => Promise.all([qc.invalidateQueries({ queryKey: workOrderKeys.all }), qc.invalidateQueries({ queryKey: queryRoots.plans })]),
  });
}
