import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { StarterView } from '../../../../shared/schemas/plans';

export const getStarters = () => api<{ starters: StarterView[] }>('/plan-starters');

export const getStartersQueryOptions = () => queryOptions({ queryKey: ['plans', 'starters'], queryFn: getStarters, staleTime: Infinity });

export const useStarters = () => useQuery(getStartersQueryOptions());
