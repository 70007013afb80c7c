import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { ApplyStartersInput, ApplyStartersResult } from '../../../../shared/schemas/plans';
import { planKeys } from './keys';

export const applyStarters = (input: ApplyStartersInput) => api<ApplyStartersResult>('/plan-starters/apply', { method: 'POST', body: input });

export function useApplyStarters() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: applyStarters, onSuccess: () => qc.invalidateQueries({ queryKey: planKeys.all }) });
}
