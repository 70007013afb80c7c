import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { ProcedureDetail } from '../../../../shared/schemas/safety-procedures';
import { safetyKeys } from './keys';

export const getProcedureQueryOptions = (id: string, version?: number) =>
  queryOptions({ queryKey: safetyKeys.procedure(id, version), queryFn: () => api<ProcedureDetail>(`/safety/procedures/${id}`, { query: { version } }) });
/** An empty id waits (e.g. until a procedure is chosen). */
export const useProcedure = (id: string, version?: number) => useQuery({ ...getProcedureQueryOptions(id, version), enabled: id !== '' });
