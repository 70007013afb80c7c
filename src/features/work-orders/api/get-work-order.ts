import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { WorkOrderDetail } from '../../../../shared/schemas/work-orders';
import { workOrderKeys } from './keys';

export const getWorkOrder = (id: string) => api<WorkOrderDetail>(`/work-orders/${id}`);

export const getWorkOrderQueryOptions = (id: string) => queryOptions({ queryKey: workOrderKeys.detail(id), queryFn: () => getWorkOrder(id) });

export const useWorkOrder = (id: string) => useQuery(getWorkOrderQueryOptions(id));
