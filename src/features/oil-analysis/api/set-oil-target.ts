import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { OilTarget, OilTargetInput } from '../../../../shared/schemas/oil-analysis';
import { oilAnalysisKeys } from './keys';

export const setOilTarget = ({ machineId, input }: { machineId: string; input: OilTargetInput }) =>
  api<OilTarget>(`/oil-units/${machineId}/target`, { method: 'PUT', body: input });

export function useSetOilTarget() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: setOilTarget, onSuccess: () => qc.invalidateQueries({ queryKey: oilAnalysisKeys.all }) });
}
