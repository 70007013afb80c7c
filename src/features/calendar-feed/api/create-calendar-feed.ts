import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { CalendarFeedStatus } from '../../../../shared/schemas/calendar-feed';
import { calendarFeedKeys } from './keys';

export const createCalendarFeed = () => api<CalendarFeedStatus>('/calendar-feed', { method: 'POST', body: {} });

export function useCreateCalendarFeed() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: createCalendarFeed, onSuccess: () => qc.invalidateQueries({ queryKey: calendarFeedKeys.all }) });
}
