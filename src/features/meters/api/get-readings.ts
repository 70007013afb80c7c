import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { ReadingRow } from '../../../../shared/schemas/machines';
import { meterKeys } from './keys';
import type { Page } from '../../../../shared/schemas/paging';

export type ReadingsFilters = { page: number; pageSize: number; dir: 'asc' | 'desc' };

export const getReadings = (meterId: string, f: ReadingsFilters) => api<Page<ReadingRow>>(`/meters/${meterId}/readings`, { query: f });

export const getReadingsQueryOptions = (meterId: string, f: ReadingsFilters) =>
  queryOptions({ queryKey: meterKeys.readings(meterId, f), queryFn: () => getReadings(meterId, f), placeholderData: keepPreviousData });

export const useReadings = (meterId: string, f: ReadingsFilters) => useQuery(getReadingsQueryOptions(meterId, f));
