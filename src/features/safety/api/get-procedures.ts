import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { ProcedureSummary } from '../../../../shared/schemas/safety-procedures';
import { safetyKeys } from './keys';

export const getProceduresQueryOptions = () =>
  queryOptions({ queryKey: safetyKeys.procedures(), queryFn: () => api<ProcedureSummary[]>('/safety/procedures') });
export const useProcedures = () => useQuery(getProceduresQueryOptions());
