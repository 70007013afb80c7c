import { useMutation } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { TrainingInput } from '../../../../shared/schemas/safety-records';
import { useInvalidateSafety } from './keys';

export function useRecordTraining() {
  const invalidate = useInvalidateSafety();
  return useMutation({
    mutationFn: (input: TrainingInput) => api<{ id: string }>('/safety/training', { method: 'POST', body: input, idempotent: true }),
    onSuccess: invalidate,
  });
}
