import { queryRoots } from '../../../lib/query-keys';

/** Stock's query keys. */
export const stockKeys = {
  all: queryRoots.stock,
  partTypes: (f: object) => [...queryRoots.stock, 'part-types', f] as const,
  suppliers: () => [...queryRoots.stock, 'suppliers'] as const,
  moves: (partTypeId: string, page: number, pageSize: number) => [...queryRoots.stock, 'moves', partTypeId, { page, pageSize }] as const,
};
