import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { CalendarFeedStatus } from '../../../../shared/schemas/calendar-feed';

export const getCalendarFeed = () => api<CalendarFeedStatus>('/calendar-feed');

export const getCalendarFeedQueryOptions = () => queryOptions({ queryKey: ['calendar-feed'], queryFn: getCalendarFeed });

export const useCalendarFeed = () => useQuery(getCalendarFeedQueryOptions());
