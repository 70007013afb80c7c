import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { OilAnalysisInput, OilAnalysisRow } from '../../../../shared/schemas/oil-analysis';

export const recordOilAnalysis = (input: OilAnalysisInput) => api<OilAnalysisRow>('/oil-analyses', { method: 'POST', body: input });

export function useRecordOilAnalysis() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: recordOilAnalysis,
    onSuccess: () => Promise.all([qc.invalidateQueries({ queryKey: ['oil-analysis'] }), qc.invalidateQueries({ queryKey: ['work-orders'] })]),
  });
}
