import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { PpeRequirementRow } from '../../../../shared/schemas/safety-ppe';
import { safetyKeys } from './keys';

export const getPpeRequirementsQueryOptions = (machineId?: string) =>
  queryOptions({ queryKey: safetyKeys.ppe(machineId), queryFn: () => api<PpeRequirementRow[]>('/safety/ppe/requirements', { query: { machineId } }) });
export const usePpeRequirements = (machineId?: string) => useQuery(getPpeRequirementsQueryOptions(machineId));
