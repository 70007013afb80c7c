import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { PunchToolRow } from '../../../../shared/schemas/punch-tools';

export const getPunchTools = (machineId?: string) => api<PunchToolRow[]>('/punch-tools', { query: { machineId } });

export const getPunchToolsQueryOptions = (machineId?: string) => queryOptions({ queryKey: ['punch-tools', 'list', { machineId }], queryFn: () => getPunchTools(machineId) });

export const usePunchTools = (machineId?: string) => useQuery(getPunchToolsQueryOptions(machineId));
