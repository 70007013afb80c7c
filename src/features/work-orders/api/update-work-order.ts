import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { UpdateWorkOrderInput } from '../../../../shared/schemas/work-orders';
import { workOrderKeys } from './keys';

export const updateWorkOrder = ({ id, ...input }: UpdateWorkOrderInput & { id: string }) =>
  api<{ ok: true }>(`/work-orders/${id}`, { method: 'PATCH', body: input });

export function useUpdateWorkOrder() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: updateWorkOrder, onSuccess: () => qc.invalidateQueries({ queryKey: workOrderKeys.all }) });
}
