import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { ListWorkOrdersQuery, WorkOrderRow } from '../../../../shared/schemas/work-orders';
import type { Page } from '../../../../shared/schemas/users';

export type WorkOrderFilters = Partial<ListWorkOrdersQuery> & { page: number; pageSize: number };

export const getWorkOrders = (f: WorkOrderFilters) => api<Page<WorkOrderRow>>('/work-orders', { query: f });

export const getWorkOrdersQueryOptions = (f: WorkOrderFilters) =>
  queryOptions({ queryKey: ['work-orders', 'list', f], queryFn: () => getWorkOrders(f), placeholderData: keepPreviousData });

export const useWorkOrders = (f: WorkOrderFilters) => useQuery(getWorkOrdersQueryOptions(f));
