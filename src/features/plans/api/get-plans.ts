import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { ListPlansQuery, PlanRow } from '../../../../shared/schemas/plans';
import { planKeys } from './keys';
import type { Page } from '../../../../shared/schemas/paging';

export type PlanFilters = Partial<ListPlansQuery> & { page: number; pageSize: number };

export const getPlans = (f: PlanFilters) => api<Page<PlanRow>>('/plans', { query: f });

export const getPlansQueryOptions = (f: PlanFilters) =>
  queryOptions({ queryKey: planKeys.list(f), queryFn: () => getPlans(f), placeholderData: keepPreviousData });

export const usePlans = (f: PlanFilters) => useQuery(getPlansQueryOptions(f));
