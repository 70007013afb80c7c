import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { RunNowResult } from '../../../../shared/schemas/job-runs';

export const runPassNow = () => api<RunNowResult>('/job-runs', { method: 'POST', body: {} });

/** Runs the scheduled pass at once; every list that the pass can change is refreshed. */
export function useRunPassNow() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: runPassNow,
    onSettled: () =>
      Promise.all([qc.invalidateQueries({ queryKey: ['job-runs'] }), qc.invalidateQueries({ queryKey: ['work-orders'] }), qc.invalidateQueries({ queryKey: ['plans'] })]),
  });
}
