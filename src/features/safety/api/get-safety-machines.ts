import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { safetyKeys } from './keys';
import type { FeedingPoint } from '../../../../shared/schemas/safety-procedures';

export type SafetyMachine = {
  id: string;
  code: string;
  name: string;
  kind: string;
  procedures: { id: string; title: string; approvedVersion: number | null }[];
  openLockouts: number;
  /** Isolation points on other machines that also feed this one. */
  feedingPoints: FeedingPoint[];
};

export const getSafetyMachinesQueryOptions = () => queryOptions({ queryKey: safetyKeys.machines(), queryFn: () => api<SafetyMachine[]>('/safety/machines') });
export const useSafetyMachines = () => useQuery(getSafetyMachinesQueryOptions());
