import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { LockoutAuthorization } from '../../../../shared/schemas/safety-records';
import { safetyKeys } from './keys';

/** Whether the signed-in person may apply locks with this procedure, and why not (asked before signing). */
export const getLockoutAuthorizationQueryOptions = (procedureId: string) =>
  queryOptions({
    queryKey: safetyKeys.authorization(procedureId),
    queryFn: () => api<LockoutAuthorization>(`/safety/procedures/${procedureId}/authorization`),
    enabled: !!procedureId,
  });
export const useLockoutAuthorization = (procedureId: string) => useQuery(getLockoutAuthorizationQueryOptions(procedureId));
