import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { FireWatchRow } from '../../../../shared/schemas/safety-records';
import { safetyKeys } from './keys';

export const getFireWatchesQueryOptions = () =>
  queryOptions({ queryKey: safetyKeys.fireWatches(), queryFn: () => api<FireWatchRow[]>('/safety/fire-watches'), refetchInterval: 60_000 });
export const useFireWatches = () => useQuery(getFireWatchesQueryOptions());
