import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { MachineDetail } from '../../../../shared/schemas/machines';
import { machineKeys } from './keys';

export const getMachine = (id: string) => api<MachineDetail>(`/machines/${id}`);

export const getMachineQueryOptions = (id: string) => queryOptions({ queryKey: machineKeys.detail(id), queryFn: () => getMachine(id) });

export const useMachine = (id: string) => useQuery(getMachineQueryOptions(id));
