import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { PunchToolRow } from '../../../../shared/schemas/punch-tools';
import { punchToolKeys } from './keys';

export const getPunchTools = (machineId?: string) => api<PunchToolRow[]>('/punch-tools', { query: { machineId } });

export const getPunchToolsQueryOptions = (machineId?: string) =>
  queryOptions({ queryKey: punchToolKeys.list(machineId), queryFn: () => getPunchTools(machineId) });

export const usePunchTools = (machineId?: string) => useQuery(getPunchToolsQueryOptions(machineId));
