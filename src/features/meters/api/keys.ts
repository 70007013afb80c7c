import { queryRoots } from '../../../lib/query-keys';

/** Meters' and readings' query keys. */
export const meterKeys = {
  all: queryRoots.meters,
  detail: (id: string) => [...queryRoots.meters, 'detail', id] as const,
  readings: (meterId: string, f: object) => [...queryRoots.meters, 'readings', meterId, f] as const,
  trend: (meterId: string, days: number) => [...queryRoots.meters, 'trend', meterId, days] as const,
};
