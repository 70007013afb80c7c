import { queryRoots } from '../../../lib/query-keys';

/** Purchasing's query keys. */
export const purchasingKeys = {
  all: queryRoots.purchasing,
  requests: (status: string) => [...queryRoots.purchasing, 'requests', status] as const,
  lowParts: () => [...queryRoots.purchasing, 'low-parts'] as const,
  suggestions: (weeks: number) => [...queryRoots.purchasing, 'suggestions', weeks] as const,
  suppliers: () => [...queryRoots.purchasing, 'suppliers'] as const,
};
