import { queryRoots } from '../../../lib/query-keys';

/** People's query keys. */
export const userKeys = {
  all: queryRoots.users,
  list: (f: object) => [...queryRoots.users, 'list', f] as const,
};
