import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { Page } from '../../../../shared/schemas/users';
import { activityLogKeys } from './keys';

export type AuditRow = { id: string; at: string; action: string; entityType: string; entityId: string | null; actor: string | null; details: Record<string, unknown> | null };
export type AuditFilters = { page: number; pageSize: number; action?: string; area?: string; actor?: string; dir?: 'asc' | 'desc' };
export type AuditPage = Page<AuditRow> & { areas: string[]; people: { id: string; name: string }[] };

export const getAuditEventsQueryOptions = (f: AuditFilters) =>
  queryOptions({ queryKey: activityLogKeys.list(f), queryFn: () => api<AuditPage>('/audit-events', { query: f }), placeholderData: keepPreviousData });

export const useAuditEvents = (f: AuditFilters) => useQuery(getAuditEventsQueryOptions(f));
