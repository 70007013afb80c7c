import { queryRoots } from '../../../lib/query-keys';

/** Maintenance plans' query keys. */
export const planKeys = {
  all: queryRoots.plans,
  list: (f: object) => [...queryRoots.plans, 'list', f] as const,
  detail: (id: string) => [...queryRoots.plans, 'detail', id] as const,
  starters: (machineId?: string) => [...queryRoots.plans, 'starters', machineId ?? 'all'] as const,
};
