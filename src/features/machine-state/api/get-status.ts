import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { MachineStatus } from '../../../../shared/schemas/machine-state';
import { machineStateKeys } from './keys';

export const getMachineStatus = (code: string) => api<MachineStatus>(`/machines/${encodeURIComponent(code)}/status`);

export const getMachineStatusQueryOptions = (code: string) =>
  queryOptions({ queryKey: machineStateKeys.status(code), queryFn: () => getMachineStatus(code), staleTime: 10_000 });

export const useMachineStatus = (code: string) => useQuery(getMachineStatusQueryOptions(code));
