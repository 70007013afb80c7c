import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { CutCheckRow } from '../../../../shared/schemas/consumables';
import { cutCheckKeys } from './keys';
import type { Page } from '../../../../shared/schemas/paging';

export type CutCheckFilters = { machineId?: string; page: number; pageSize: number };

export const getCutChecks = (f: CutCheckFilters) => api<Page<CutCheckRow>>('/cut-checks', { query: f });

export const getCutChecksQueryOptions = (f: CutCheckFilters) =>
  queryOptions({ queryKey: cutCheckKeys.list(f), queryFn: () => getCutChecks(f), placeholderData: keepPreviousData });

export const useCutChecks = (f: CutCheckFilters) => useQuery(getCutChecksQueryOptions(f));
