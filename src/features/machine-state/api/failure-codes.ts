import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { FailureCodeInput, FailureCodeRow, FailureCodeUpdate } from '../../../../shared/schemas/failure-codes';
import { machineStateKeys } from './keys';

/** Adding or changing a code refreshes the lists and the reliability figures that name codes. */
function useRefreshCodes() {
  const qc = useQueryClient();
  return () => qc.invalidateQueries({ queryKey: machineStateKeys.all });
}

export function useCreateFailureCode() {
  const refresh = useRefreshCodes();
  return useMutation({ mutationFn: (body: FailureCodeInput) => api<FailureCodeRow>('/failure-codes', { method: 'POST', body }), onSuccess: refresh });
}

export function useUpdateFailureCode() {
  const refresh = useRefreshCodes();
  return useMutation({
    mutationFn: ({ id, ...body }: FailureCodeUpdate & { id: string }) => api<FailureCodeRow>(`/failure-codes/${id}`, { method: 'PATCH', body }),
    onSuccess: refresh,
  });
}
