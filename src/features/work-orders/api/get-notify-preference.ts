import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { NotifyPreference } from '../../../../shared/schemas/work-orders';
import { workOrderKeys } from './keys';

export const getNotifyPreference = () => api<NotifyPreference>('/notify-preference');

export const getNotifyPreferenceQueryOptions = () => queryOptions({ queryKey: workOrderKeys.notifyPreference(), queryFn: getNotifyPreference });

export const useNotifyPreference = () => useQuery(getNotifyPreferenceQueryOptions());
