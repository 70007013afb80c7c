import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { queryRoots } from '../../../lib/query-keys';
import type { DeviationInput } from '../../../../shared/schemas/work-orders';
import { workOrderKeys } from './keys';

/** A failed safety-critical line is followed up once: the work order, the machine's state and the safety log all change. */
function useRefreshAfterFollowUp() {
  const qc = useQueryClient();
  return () =>
    Promise.all([
      qc.invalidateQueries({ queryKey: workOrderKeys.all }),
      qc.invalidateQueries({ queryKey: queryRoots.machineState }),
      qc.invalidateQueries({ queryKey: queryRoots.machines }),
      qc.invalidateQueries({ queryKey: queryRoots.safety }),
    ]);
}

export function useRaiseRepairForCheck() {
  const refresh = useRefreshAfterFollowUp();
  return useMutation({
    mutationFn: ({ id, key }: { id: string; key: string }) =>
      api<{ id: string; number: number }>(`/work-orders/${id}/checklist/${encodeURIComponent(key)}/repair`, { method: 'POST' }),
    onSuccess: refresh,
  });
}

export function useSignDeviation() {
  const refresh = useRefreshAfterFollowUp();
  return useMutation({
    mutationFn: ({ id, key, ...body }: DeviationInput & { id: string; key: string }) =>
      api<{ signOffId: string }>(`/work-orders/${id}/checklist/${encodeURIComponent(key)}/deviation`, { method: 'POST', body }),
    onSuccess: refresh,
  });
}
