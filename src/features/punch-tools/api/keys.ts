import { queryRoots } from '../../../lib/query-keys';

/** Punch tools' query keys. */
export const punchToolKeys = {
  all: queryRoots.punchTools,
  list: (machineId?: string) => [...queryRoots.punchTools, 'list', { machineId }] as const,
};
