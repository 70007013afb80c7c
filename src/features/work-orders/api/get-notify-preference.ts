import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { NotifyPreference } from '../../../../shared/schemas/work-orders';

export const getNotifyPreference = () => api<NotifyPreference>('/notify-preference');

export const getNotifyPreferenceQueryOptions = () => queryOptions({ queryKey: ['notify-preference'], queryFn: getNotifyPreference });

export const useNotifyPreference = () => useQuery(getNotifyPreferenceQueryOptions());
