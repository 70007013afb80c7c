import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { safetyKeys } from './keys';

/** The work order a lockout protects, for its number and title (served by the work-orders module). */
export type LinkedWorkOrder = { id: string; number: number; title: string; status: string };

export const getLinkedWorkOrderQueryOptions = (id: string) =>
  queryOptions({
    queryKey: [...safetyKeys.all, 'work-order', id] as const,
    queryFn: () => api<LinkedWorkOrder>(`/work-orders/${id}`),
    retry: false,
    staleTime: 60_000,
  });
export const useLinkedWorkOrder = (id: string | null | undefined) => useQuery({ ...getLinkedWorkOrderQueryOptions(id ?? ''), enabled: !!id });
