import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { ReliabilityReport } from '../../../../shared/schemas/reliability';
import type { FailureCodeRow } from '../../../../shared/schemas/failure-codes';
import { machineStateKeys } from './keys';

export type ReliabilityFilters = { from: string; to: string; machineId?: string; failureCode?: string };

export const getReliability = (f: ReliabilityFilters) => api<ReliabilityReport>('/reliability', { query: f });

export const getReliabilityQueryOptions = (f: ReliabilityFilters) =>
  queryOptions({ queryKey: machineStateKeys.reliability(f), queryFn: () => getReliability(f), placeholderData: keepPreviousData });

export const useReliability = (f: ReliabilityFilters) => useQuery(getReliabilityQueryOptions(f));

export const useFailureCodes = () =>
  useQuery({ queryKey: machineStateKeys.failureCodes(), queryFn: () => api<FailureCodeRow[]>('/failure-codes'), staleTime: 60_000 });
