import { queryRoots } from '../../../lib/query-keys';

/** The station page's query keys: every one starts with 'station', so a change at the machine refreshes the page at once. */
export const stationKeys = {
  all: queryRoots.station,
  list: () => [...queryRoots.station, 'list'] as const,
  detail: (code: string) => [...queryRoots.station, 'detail', code.toUpperCase()] as const,
  changes: (f: object) => [...queryRoots.station, 'changes', f] as const,
};
