import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { RunNowResult } from '../../../../shared/schemas/job-runs';
import { queryRoots } from '../../../lib/query-keys';
import { jobRunKeys } from './keys';

export const runPassNow = () => api<RunNowResult>('/job-runs', { method: 'POST', body: {} });

/** Runs the scheduled pass at once; every list that the pass can change is refreshed. */
export function useRunPassNow() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: runPassNow,
    onSettled: () =>
      Promise.all([
        qc.invalidateQueries({ queryKey: jobRunKeys.all }),
        qc.invalidateQueries({ queryKey: queryRoots.workOrders }),
        qc.invalidateQueries({ queryKey: queryRoots.plans }),
      ]),
  });
}
