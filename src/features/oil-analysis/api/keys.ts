import { queryRoots } from '../../../lib/query-keys';

/** Oil analyses' query keys. */
export const oilAnalysisKeys = {
  all: queryRoots.oilAnalysis,
  list: (f: object) => [...queryRoots.oilAnalysis, 'list', f] as const,
  units: () => [...queryRoots.oilAnalysis, 'units'] as const,
};
