import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { PlanLookups } from '../../../../shared/schemas/plans';

export const getPlanLookups = () => api<PlanLookups>('/plan-lookups');

export const getPlanLookupsQueryOptions = () => queryOptions({ queryKey: ['plan-lookups'], queryFn: getPlanLookups, staleTime: 60_000 });

export const usePlanLookups = () => useQuery(getPlanLookupsQueryOptions());
