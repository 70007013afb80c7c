import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { PurchaseRequestRow } from '../../../../shared/schemas/purchasing';
import { purchasingKeys } from './keys';

export const getRequests = (status: string) => api<PurchaseRequestRow[]>('/purchase-requests', { query: { status } });
export const getRequestsQueryOptions = (status = 'open') => queryOptions({ queryKey: purchasingKeys.requests(status), queryFn: () => getRequests(status) });
export const useRequests = (status = 'open') => useQuery(getRequestsQueryOptions(status));
