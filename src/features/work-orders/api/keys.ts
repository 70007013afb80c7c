import { queryRoots } from '../../../lib/query-keys';

/** Work orders' query keys. */
export const workOrderKeys = {
  all: queryRoots.workOrders,
  list: (f: object) => [...queryRoots.workOrders, 'list', f] as const,
  detail: (id: string) => [...queryRoots.workOrders, 'detail', id] as const,
  notifyPreference: () => [...queryRoots.workOrders, 'notify-preference'] as const,
  // Plan options for the raise form live under the plans root, so a plan change refreshes them.
  planOptions: () => [...queryRoots.plans, 'options'] as const,
};
