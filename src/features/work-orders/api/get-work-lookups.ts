import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { PlanLookups } from '../../../../shared/schemas/plans';

/** Machines, parts and people for work order forms and filters (the plans API serves them). */
export const getWorkLookups = () => api<PlanLookups>('/plan-lookups');

export const getWorkLookupsQueryOptions = () => queryOptions({ queryKey: ['plan-lookups'], queryFn: getWorkLookups, staleTime: 60_000 });

export const useWorkLookups = () => useQuery(getWorkLookupsQueryOptions());
