import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { LockoutDetail } from '../../../../shared/schemas/safety-lockout';
import { safetyKeys } from './keys';

export const getLockoutQueryOptions = (id: string) =>
  queryOptions({ queryKey: safetyKeys.lockout(id), queryFn: () => api<LockoutDetail>(`/safety/lockouts/${id}`) });
export const useLockout = (id: string) => useQuery(getLockoutQueryOptions(id));
