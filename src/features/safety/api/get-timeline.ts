import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { TimelineWeek } from '../../../../shared/schemas/safety-audit';
import { safetyKeys } from './keys';

export const getTimelineQueryOptions = (weeks: number) =>
  queryOptions({ queryKey: safetyKeys.timeline(weeks), queryFn: () => api<TimelineWeek[]>('/safety/audit/timeline', { query: { weeks } }) });
export const useTimeline = (weeks: number) => useQuery(getTimelineQueryOptions(weeks));
