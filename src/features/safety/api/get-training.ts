import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { TrainingRow } from '../../../../shared/schemas/safety-records';
import { safetyKeys } from './keys';

export const getTrainingQueryOptions = () => queryOptions({ queryKey: safetyKeys.training(), queryFn: () => api<TrainingRow[]>('/safety/training') });
export const useTraining = () => useQuery(getTrainingQueryOptions());
