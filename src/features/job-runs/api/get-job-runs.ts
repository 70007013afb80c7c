import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { JobRunRow } from '../../../../shared/schemas/job-runs';
import { jobRunKeys } from './keys';
import type { Page } from '../../../../shared/schemas/paging';

export const getJobRuns = (f: { page: number; pageSize: number }) => api<Page<JobRunRow>>('/job-runs', { query: f });

export const getJobRunsQueryOptions = (f: { page: number; pageSize: number }) =>
  queryOptions({ queryKey: jobRunKeys.list(f), queryFn: () => getJobRuns(f), placeholderData: keepPreviousData, refetchInterval: 60_000 });

export const useJobRuns = (f: { page: number; pageSize: number }) => useQuery(getJobRunsQueryOptions(f));
