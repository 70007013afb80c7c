import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { queryRoots } from '../../../lib/query-keys';
import { workOrderKeys } from './keys';

export const returnPart = ({ id, lineId }: { id: string; lineId: string }) => api<{ ok: true }>(`/work-orders/${id}/parts/${lineId}`, { method: 'DELETE' });

export function useReturnPart() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: returnPart,
    onSuccess: () => Promise.all([qc.invalidateQueries({ queryKey: workOrderKeys.all }), qc.invalidateQueries({ queryKey: queryRoots.lookups })]),
  });
}
