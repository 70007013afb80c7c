import { useMutation } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { FireWatchRow, StartFireWatchInput } from '../../../../shared/schemas/safety-records';
import { useInvalidateSafety } from './keys';

export function useStartFireWatch() {
  const invalidate = useInvalidateSafety();
  return useMutation({
    mutationFn: (input: StartFireWatchInput) => api<FireWatchRow>('/safety/fire-watches', { method: 'POST', body: input, idempotent: true }),
    onSuccess: invalidate,
  });
}
