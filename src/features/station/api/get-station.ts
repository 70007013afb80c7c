import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { StationView } from '../../../../shared/schemas/consumables';
import { stationKeys } from './keys';

export const getStation = (code: string) => api<StationView>(`/stations/${encodeURIComponent(code)}`);

export const getStationQueryOptions = (code: string) =>
  queryOptions({ queryKey: stationKeys.detail(code), queryFn: () => getStation(code), staleTime: 10_000 });

export const useStation = (code: string) => useQuery(getStationQueryOptions(code));
