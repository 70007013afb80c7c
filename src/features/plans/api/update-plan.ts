import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { PlanInput } from '../../../../shared/schemas/plans';
import { planKeys } from './keys';

export const updatePlan = ({ id, input }: { id: string; input: PlanInput }) => api<{ ok: true }>(`/plans/${id}`, { method: 'PUT', body: input });

export function useUpdatePlan() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: updatePlan, onSuccess: () => qc.invalidateQueries({ queryKey: planKeys.all }) });
}
