import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { AbsentRemovalRow } from '../../../../shared/schemas/safety-absent-removal';
import { safetyKeys } from './keys';

/** GET /safety/lockouts/:id/absent-removals */
export const getAbsentRemovalsQueryOptions = (lockoutId: string) =>
  queryOptions({ queryKey: safetyKeys.absentRemovals(lockoutId), queryFn: () => api<AbsentRemovalRow[]>(`/safety/lockouts/${lockoutId}/absent-removals`) });
export const useAbsentRemovals = (lockoutId: string) => useQuery(getAbsentRemovalsQueryOptions(lockoutId));
