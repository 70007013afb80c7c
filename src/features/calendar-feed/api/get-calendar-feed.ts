import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { CalendarFeedStatus } from '../../../../shared/schemas/calendar-feed';
import { calendarFeedKeys } from './keys';

export const getCalendarFeed = () => api<CalendarFeedStatus>('/calendar-feed');

export const getCalendarFeedQueryOptions = () => queryOptions({ queryKey: calendarFeedKeys.all, queryFn: getCalendarFeed });

export const useCalendarFeed = () => useQuery(getCalendarFeedQueryOptions());
