import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { MeterTrend } from '../../../../shared/schemas/machines';
import { meterKeys } from './keys';

export const getTrend = (meterId: string, days: number) => api<MeterTrend>(`/meters/${meterId}/trend`, { query: { days } });

export const getTrendQueryOptions = (meterId: string, days = 365) =>
  queryOptions({ queryKey: meterKeys.trend(meterId, days), queryFn: () => getTrend(meterId, days) });

export const useTrend = (meterId: string, days = 365) => useQuery(getTrendQueryOptions(meterId, days));
