import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { ListWorkOrdersQuery, WorkOrderRow } from '../../../../shared/schemas/work-orders';
import { workOrderKeys } from './keys';
import type { Page } from '../../../../shared/schemas/paging';

export type WorkOrderFilters = Partial<ListWorkOrdersQuery> & { page: number; pageSize: number };

export const getWorkOrders = (f: WorkOrderFilters) => api<Page<WorkOrderRow>>('/work-orders', { query: f });

export const getWorkOrdersQueryOptions = (f: WorkOrderFilters) =>
  queryOptions({ queryKey: workOrderKeys.list(f), queryFn: () => getWorkOrders(f), placeholderData: keepPreviousData });

export const useWorkOrders = (f: WorkOrderFilters) => useQuery(getWorkOrdersQueryOptions(f));
