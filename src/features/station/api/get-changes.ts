import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { ChangeRow } from '../../../../shared/schemas/consumables';
import { stationKeys } from './keys';
import type { Page } from '../../../../shared/schemas/paging';

export type ChangesFilters = { machineId: string; page: number; pageSize: number };

export const getChanges = (f: ChangesFilters) => api<Page<ChangeRow>>('/consumable-changes', { query: f });

export const getChangesQueryOptions = (f: ChangesFilters) =>
  queryOptions({ queryKey: stationKeys.changes(f), queryFn: () => getChanges(f), placeholderData: keepPreviousData });

export const useChanges = (f: ChangesFilters) => useQuery(getChangesQueryOptions(f));
