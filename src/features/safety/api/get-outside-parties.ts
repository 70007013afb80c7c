import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { OutsidePartyRow } from '../../../../shared/schemas/safety-outside-personnel';
import { safetyKeys } from './keys';

/** GET /safety/lockouts/:id/outside-parties */
export const getOutsidePartiesQueryOptions = (lockoutId: string) =>
  queryOptions({ queryKey: safetyKeys.outsideParties(lockoutId), queryFn: () => api<OutsidePartyRow[]>(`/safety/lockouts/${lockoutId}/outside-parties`) });
export const useOutsideParties = (lockoutId: string) => useQuery(getOutsidePartiesQueryOptions(lockoutId));
