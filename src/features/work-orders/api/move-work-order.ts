import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { MoveWorkOrderInput } from '../../../../shared/schemas/work-orders';

export const moveWorkOrder = ({ id, ...input }: MoveWorkOrderInput & { id: string }) => api<{ ok: true }>(`/work-orders/${id}/move`, { method: 'POST', body: input });

export function useMoveWorkOrder() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: moveWorkOrder,
    onSuccess: () => Promise.all([qc.invalidateQueries({ queryKey: ['work-orders'] }), qc.invalidateQueries({ queryKey: ['plans'] })]),
  });
}
