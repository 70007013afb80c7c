import { useMutation } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { PpeCheckInput } from '../../../../shared/schemas/safety-ppe';
import { useInvalidateSafety } from './keys';

export function useRecordPpeCheck() {
  const invalidate = useInvalidateSafety();
  return useMutation({
    mutationFn: (input: PpeCheckInput) => api<{ id: string; signOffId: string }>('/safety/ppe/checks', { method: 'POST', body: input, idempotent: true }),
    onSuccess: invalidate,
  });
}
