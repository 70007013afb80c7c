import { queryRoots } from '../../../lib/query-keys';

/** The signed-in person's query keys. */
export const authKeys = {
  all: queryRoots.auth,
  me: () => [...queryRoots.auth, 'me'] as const,
};
