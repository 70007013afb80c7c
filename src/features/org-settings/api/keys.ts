import { queryRoots } from '../../../lib/query-keys';

/** The shop's own settings. */
export const orgSettingsKeys = {
  all: queryRoots.orgSettings,
};
