import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { RaiseWorkOrderInput } from '../../../../shared/schemas/work-orders';
import { workOrderKeys } from './keys';

export const raiseWorkOrder = (input: RaiseWorkOrderInput) => api<{ id: string; number: number }>('/work-orders', { method: 'POST', body: input });

export function useRaiseWorkOrder() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: raiseWorkOrder, onSuccess: () => qc.invalidateQueries({ queryKey: workOrderKeys.all }) });
}
