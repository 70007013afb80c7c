import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { StarterView } from '../../../../shared/schemas/plans';
import { planKeys } from './keys';

/** With a machine, each starter says whether it fits that machine (meters found, already applied …). */
export const getStarters = (machineId?: string) => api<{ starters: StarterView[] }>('/plan-starters', { query: machineId ? { machineId } : {} });

// Under ['plans'] so that applying starters (which invalidates ['plans']) refreshes "already applied".
export const getStartersQueryOptions = (machineId?: string) =>
  queryOptions({ queryKey: planKeys.starters(machineId), queryFn: () => getStarters(machineId), staleTime: machineId ? 30_000 : Infinity });

export const useStarters = (machineId?: string) => useQuery({ ...getStartersQueryOptions(machineId), enabled: Boolean(machineId) });
