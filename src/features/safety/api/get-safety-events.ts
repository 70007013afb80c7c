import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { SafetyEventRow } from '../../../../shared/schemas/safety-audit';
import type { Page } from '../../../../shared/schemas/paging';
import { safetyKeys } from './keys';

export type SafetyEventFilters = { page: number; pageSize: number; kind?: 'refused' | 'alarm'; machineId?: string };
export const getSafetyEventsQueryOptions = (f: SafetyEventFilters) =>
  queryOptions({ queryKey: safetyKeys.events(f), queryFn: () => api<Page<SafetyEventRow>>('/safety/events', { query: f }), placeholderData: keepPreviousData });
export const useSafetyEvents = (f: SafetyEventFilters) => useQuery(getSafetyEventsQueryOptions(f));
