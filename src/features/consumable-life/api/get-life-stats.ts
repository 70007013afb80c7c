import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { LifeStats } from '../../../../shared/schemas/consumables';
import { consumableLifeKeys } from './keys';

export type LifeFilters = { partTypeId: string; machineId?: string };

export const getLifeStats = (f: LifeFilters) => api<LifeStats>('/consumable-life', { query: f });

export const getLifeStatsQueryOptions = (f: LifeFilters) =>
  queryOptions({ queryKey: consumableLifeKeys.life(f), queryFn: () => getLifeStats(f), enabled: !!f.partTypeId });

export const useLifeStats = (f: LifeFilters) => useQuery(getLifeStatsQueryOptions(f));
