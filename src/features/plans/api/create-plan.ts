import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { PlanInput } from '../../../../shared/schemas/plans';
import { planKeys } from './keys';

export const createPlan = (input: PlanInput) => api<{ id: string }>('/plans', { method: 'POST', body: input });

export function useCreatePlan() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: createPlan, onSuccess: () => qc.invalidateQueries({ queryKey: planKeys.all }) });
}
