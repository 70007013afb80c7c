import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { safetyKeys } from './keys';

export type SafetyMachine = {
  id: string;
  code: string;
  name: string;
  kind: string;
  procedures: { id: string; title: string; approvedVersion: number | null }[];
  openLockouts: number;
};

export const getSafetyMachinesQueryOptions = () => queryOptions({ queryKey: safetyKeys.machines(), queryFn: () => api<SafetyMachine[]>('/safety/machines') });
export const useSafetyMachines = () => useQuery(getSafetyMachinesQueryOptions());
