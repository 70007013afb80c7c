import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { PlanDetail } from '../../../../shared/schemas/plans';
import { planKeys } from './keys';

export const getPlan = (id: string) => api<PlanDetail>(`/plans/${id}`);

export const getPlanQueryOptions = (id: string) => queryOptions({ queryKey: planKeys.detail(id), queryFn: () => getPlan(id) });

export const usePlan = (id: string) => useQuery(getPlanQueryOptions(id));
