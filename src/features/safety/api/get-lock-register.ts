import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { LockRegisterQuery, LockRegisterRow } from '../../../../shared/schemas/safety-lockout';
import type { Page } from '../../../../shared/schemas/paging';
import { safetyKeys } from './keys';

export type LockRegisterFilters = Partial<LockRegisterQuery> & { page: number; pageSize: number };
export const getLockRegisterQueryOptions = (f: LockRegisterFilters) =>
  queryOptions({ queryKey: safetyKeys.locks(f), queryFn: () => api<Page<LockRegisterRow>>('/safety/locks', { query: f }), placeholderData: keepPreviousData });
export const useLockRegister = (f: LockRegisterFilters) => useQuery(getLockRegisterQueryOptions(f));
