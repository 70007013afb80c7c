import { queryRoots } from '../../../lib/query-keys';

/** Scheduled passes' query keys. */
export const jobRunKeys = {
  all: queryRoots.jobRuns,
  list: (f: object) => [...queryRoots.jobRuns, 'list', f] as const,
};
