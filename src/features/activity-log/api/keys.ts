import { queryRoots } from '../../../lib/query-keys';

/** The activity log's query keys. */
export const activityLogKeys = {
  all: queryRoots.activityLog,
  list: (f: object) => [...queryRoots.activityLog, 'list', f] as const,
};
