import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { TestWindowRow } from '../../../../shared/schemas/safety-testing-window';
import { safetyKeys } from './keys';

/** GET /safety/lockouts/:id/test-windows — newest first. */
export const getTestWindowsQueryOptions = (lockoutId: string) =>
  queryOptions({ queryKey: safetyKeys.testWindows(lockoutId), queryFn: () => api<TestWindowRow[]>(`/safety/lockouts/${lockoutId}/test-windows`) });
export const useTestWindows = (lockoutId: string) => useQuery(getTestWindowsQueryOptions(lockoutId));
