import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { activityLogKeys } from './keys';
import type { Page } from '../../../../shared/schemas/paging';

export type ActivityRow = {
  id: string;
  at: string;
  action: string;
  entityType: string;
  entityId: string | null;
  actor: string | null;
  details: Record<string, unknown> | null;
};
export type ActivityFilters = { page: number; pageSize: number; action?: string; area?: string; actor?: string; dir?: 'asc' | 'desc' };
export type ActivityPage = Page<ActivityRow> & { areas: string[]; people: { id: string; name: string }[] };

export const getActivityLogQueryOptions = (f: ActivityFilters) =>
  queryOptions({ queryKey: activityLogKeys.list(f), queryFn: () => api<ActivityPage>('/audit-events', { query: f }), placeholderData: keepPreviousData });

export const useActivityLog = (f: ActivityFilters) => useQuery(getActivityLogQueryOptions(f));
