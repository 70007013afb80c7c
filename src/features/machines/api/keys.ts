import { queryRoots } from '../../../lib/query-keys';

/** Machines' query keys. */
export const machineKeys = {
  all: queryRoots.machines,
  list: (f: object) => [...queryRoots.machines, 'list', f] as const,
  detail: (id: string) => [...queryRoots.machines, 'detail', id] as const,
  photos: (machineId: string) => [...queryRoots.machines, 'photos', machineId] as const,
};
