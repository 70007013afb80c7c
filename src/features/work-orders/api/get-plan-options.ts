import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { PlanRow } from '../../../../shared/schemas/plans';
import { workOrderKeys } from './keys';

/** Plans (active and retired) for the work list's plan filter; a shop has tens, not thousands. */
export const getPlanOptions = () => api<{ rows: PlanRow[]; total: number }>('/plans', { query: { active: 'all', sort: 'title', dir: 'asc', pageSize: 200 } });

export const getPlanOptionsQueryOptions = () => queryOptions({ queryKey: workOrderKeys.planOptions(), queryFn: getPlanOptions, staleTime: 60_000 });

export const usePlanOptions = () => useQuery(getPlanOptionsQueryOptions());
