import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { ListOilAnalysesQuery, OilAnalysisRow } from '../../../../shared/schemas/oil-analysis';
import { oilAnalysisKeys } from './keys';
import type { Page } from '../../../../shared/schemas/paging';

export type OilFilters = { machineId?: string; page: number; pageSize: number; sort?: ListOilAnalysesQuery['sort']; dir?: ListOilAnalysesQuery['dir'] };

export const getOilAnalyses = (f: OilFilters) => api<Page<OilAnalysisRow>>('/oil-analyses', { query: f });

export const getOilAnalysesQueryOptions = (f: OilFilters) =>
  queryOptions({ queryKey: oilAnalysisKeys.list(f), queryFn: () => getOilAnalyses(f), placeholderData: keepPreviousData });

export const useOilAnalyses = (f: OilFilters) => useQuery(getOilAnalysesQueryOptions(f));
