import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { SafetyTaskRow } from '../../../../shared/schemas/safety-records';
import { safetyKeys } from './keys';

export const getSafetyTasksQueryOptions = () => queryOptions({ queryKey: safetyKeys.tasks(), queryFn: () => api<SafetyTaskRow[]>('/safety/tasks') });
export const useSafetyTasks = () => useQuery(getSafetyTasksQueryOptions());
