import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { NotifyPreference, NotifyPreferenceInput } from '../../../../shared/schemas/work-orders';
import { workOrderKeys } from './keys';

export const setNotifyPreference = (input: NotifyPreferenceInput) => api<NotifyPreference>('/notify-preference', { method: 'PUT', body: input });

export function useSetNotifyPreference() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: setNotifyPreference, onSuccess: () => qc.invalidateQueries({ queryKey: workOrderKeys.notifyPreference() }) });
}
