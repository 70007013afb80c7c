import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { OilAnalysisInput, OilAnalysisRow } from '../../../../shared/schemas/oil-analysis';
import { queryRoots } from '../../../lib/query-keys';
import { oilAnalysisKeys } from './keys';

export const recordOilAnalysis = (input: OilAnalysisInput) => api<OilAnalysisRow>('/oil-analyses', { method: 'POST', body: input });

export function useRecordOilAnalysis() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: recordOilAnalysis,
    onSuccess: () => Promise.all([qc.invalidateQueries({ queryKey: oilAnalysisKeys.all }), qc.invalidateQueries({ queryKey: queryRoots.workOrders })]),
  });
}
