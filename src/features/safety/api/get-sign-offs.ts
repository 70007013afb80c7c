import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { ListSignOffsQuery, SignOffRow } from '../../../../shared/schemas/safety-sign-offs';
import { safetyKeys } from './keys';
import type { Page } from '../../../../shared/schemas/paging';

export type SignOffFilters = Partial<ListSignOffsQuery> & { page: number; pageSize: number };
export const getSignOffsQueryOptions = (f: SignOffFilters) =>
  queryOptions({
    queryKey: safetyKeys.signOffs(f),
    queryFn: () => api<Page<SignOffRow>>('/safety/sign-offs', { query: f }),
    placeholderData: keepPreviousData,
  });
export const useSignOffs = (f: SignOffFilters, enabled = true) => useQuery({ ...getSignOffsQueryOptions(f), enabled });

/** Link for the CSV or PDF export with the same filters (the browser downloads it). */
export function exportHref(kind: 'csv' | 'pdf', f: Omit<SignOffFilters, 'page' | 'pageSize'>) {
  const params = new URLSearchParams();
  for (const [k, v] of Object.entries(f)) if (v !== undefined && v !== null && v !== '') params.set(k, String(v));
  const qs = params.toString();
  return `/api/safety/audit/export.${kind}${qs ? `?${qs}` : ''}`;
}
