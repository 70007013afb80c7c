import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { queryRoots } from '../../../lib/query-keys';
import type { DowntimeRow, FaultReportResult, MachineStatus } from '../../../../shared/schemas/machine-state';
import type { DowntimeCodesInput } from '../../../../shared/schemas/failure-codes';
import { machineStateKeys } from './keys';

export type FaultInput = { description: string; takeOutOfService: boolean; failureCode?: string | null; photo?: File | null };

/** JSON for the common case; multipart with the details in `data` when a photo comes along. */
export function reportFault(code: string, { photo, ...input }: FaultInput) {
  const path = `/machines/${encodeURIComponent(code)}/faults`;
  if (!photo) return api<FaultReportResult>(path, { method: 'POST', body: input });
  const form = new FormData();
  form.append('data', JSON.stringify(input));
  form.append('photo', photo);
  return api<FaultReportResult>(path, { method: 'POST', body: form });
}

/** A state change shows on the station, the machine list, the home page and the work lists. */
function useRefreshAfter() {
  const qc = useQueryClient();
  return () =>
    Promise.all([
      qc.invalidateQueries({ queryKey: machineStateKeys.all }),
      qc.invalidateQueries({ queryKey: queryRoots.machines }),
      qc.invalidateQueries({ queryKey: queryRoots.station }),
      qc.invalidateQueries({ queryKey: queryRoots.workOrders }),
    ]);
}

export function useReportFault(code: string) {
  const refresh = useRefreshAfter();
  return useMutation({ mutationFn: (input: FaultInput) => reportFault(code, input), onSuccess: refresh });
}

export function useReturnToService(code: string) {
  const refresh = useRefreshAfter();
  return useMutation({
    mutationFn: (note: string | null) => api<MachineStatus>(`/machines/${encodeURIComponent(code)}/return-to-service`, { method: 'POST', body: { note } }),
    onSuccess: refresh,
  });
}

export function useTakeOutOfService(code: string) {
  const refresh = useRefreshAfter();
  return useMutation({
    mutationFn: (input: { reason: string; kind: 'failure' | 'planned'; failureCode?: string | null }) =>
      api<MachineStatus>(`/machines/${encodeURIComponent(code)}/out-of-service`, { method: 'POST', body: input }),
    onSuccess: refresh,
  });
}

export const getDowntimesQueryOptions = (code: string) =>
  queryOptions({ queryKey: machineStateKeys.downtimes(code), queryFn: () => api<DowntimeRow[]>(`/machines/${encodeURIComponent(code)}/downtimes`) });
export const useDowntimes = (code: string) => useQuery(getDowntimesQueryOptions(code));

/** Codes a stop once its mode, cause and remedy are known; the reliability figures group by them. */
export function useCodeDowntime() {
  const refresh = useRefreshAfter();
  return useMutation({
    mutationFn: ({ id, ...body }: DowntimeCodesInput & { id: string }) => api<{ ok: true }>(`/downtimes/${id}`, { method: 'PATCH', body }),
    onSuccess: refresh,
  });
}
