import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from './api-client';
import { queryRoots } from './query-keys';
import type { PlanLookups } from '../../shared/schemas/plans';

/** Machines, parts and people for the plan and work-order forms and filters (the plans API serves them). */
export const getLookups = () => api<PlanLookups>('/plan-lookups');

export const getLookupsQueryOptions = () => queryOptions({ queryKey: queryRoots.lookups, queryFn: getLookups, staleTime: 60_000 });

export const useLookups = () => useQuery(getLookupsQueryOptions());
