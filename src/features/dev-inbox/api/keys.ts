import { queryRoots } from '../../../lib/query-keys';

/** The development inbox's query keys. */
export const devInboxKeys = {
  all: queryRoots.devInbox,
};
