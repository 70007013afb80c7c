import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { MeterRow } from '../../../../shared/schemas/machines';
import { meterKeys } from './keys';

export const getMeter = (id: string) => api<MeterRow>(`/meters/${id}`);

export const getMeterQueryOptions = (id: string) => queryOptions({ queryKey: meterKeys.detail(id), queryFn: () => getMeter(id) });

export const useMeter = (id: string) => useQuery(getMeterQueryOptions(id));
