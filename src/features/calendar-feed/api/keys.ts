import { queryRoots } from '../../../lib/query-keys';

/** The calendar feed's query keys. */
export const calendarFeedKeys = {
  all: queryRoots.calendarFeed,
};
