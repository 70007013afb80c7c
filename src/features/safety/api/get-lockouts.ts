import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { ListLockoutsQuery, LockoutRow } from '../../../../shared/schemas/safety-lockout';
import { safetyKeys } from './keys';
import type { Page } from '../../../../shared/schemas/paging';

export type LockoutFilters = Partial<ListLockoutsQuery> & { page: number; pageSize: number };
export const getLockoutsQueryOptions = (f: LockoutFilters) =>
  queryOptions({ queryKey: safetyKeys.lockouts(f), queryFn: () => api<Page<LockoutRow>>('/safety/lockouts', { query: f }), placeholderData: keepPreviousData });
export const useLockouts = (f: LockoutFilters) => useQuery(getLockoutsQueryOptions(f));
