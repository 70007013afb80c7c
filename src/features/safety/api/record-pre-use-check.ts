import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { queryRoots } from '../../../lib/query-keys';
import type { PreUseCheckInput, PreUseCheckResult } from '../../../../shared/schemas/pre-use-checks';
import { safetyKeys } from './keys';

/** A failed check can stop the machine and raise a repair: the station, its state and the work lists refresh too. */
export function useRecordPreUseCheck(code: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: PreUseCheckInput) =>
      api<PreUseCheckResult>(`/machines/${encodeURIComponent(code)}/pre-use-checks`, { method: 'POST', body: input, idempotent: true }),
    onSuccess: () =>
      Promise.all([safetyKeys.all, queryRoots.station, queryRoots.machineState, queryRoots.workOrders].map((queryKey) => qc.invalidateQueries({ queryKey }))),
  });
}
