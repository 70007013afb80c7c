import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { CalendarFeedStatus } from '../../../../shared/schemas/calendar-feed';
import { calendarFeedKeys } from './keys';

export const revokeCalendarFeed = () => api<CalendarFeedStatus>('/calendar-feed', { method: 'DELETE' });

export function useRevokeCalendarFeed() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: revokeCalendarFeed, onSuccess: () => qc.invalidateQueries({ queryKey: calendarFeedKeys.all }) });
}
