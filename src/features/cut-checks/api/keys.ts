import { queryRoots } from '../../../lib/query-keys';

/** Cut-quality checks' query keys. */
export const cutCheckKeys = {
  all: queryRoots.cutChecks,
  list: (f: object) => [...queryRoots.cutChecks, 'list', f] as const,
};
