import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { MachineRow } from '../../../../shared/schemas/machines';
import { machineKeys } from './keys';

export type MachinesFilters = { includeInactive?: boolean };

export const getMachines = (f: MachinesFilters) => api<MachineRow[]>('/machines', { query: { includeInactive: f.includeInactive ? 'true' : undefined } });

export const getMachinesQueryOptions = (f: MachinesFilters = {}) => queryOptions({ queryKey: machineKeys.list(f), queryFn: () => getMachines(f) });

export const useMachines = (f: MachinesFilters = {}) => useQuery(getMachinesQueryOptions(f));
