import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { InspectionRow } from '../../../../shared/schemas/safety-records';
import { safetyKeys } from './keys';

export const getInspectionsQueryOptions = () =>
  queryOptions({ queryKey: safetyKeys.inspections(), queryFn: () => api<InspectionRow[]>('/safety/inspections') });
export const useInspections = () => useQuery(getInspectionsQueryOptions());
