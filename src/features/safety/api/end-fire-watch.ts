import { useMutation } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { EndFireWatchInput, FireWatchRow } from '../../../../shared/schemas/safety-records';
import { useInvalidateSafety } from './keys';

export function useEndFireWatch() {
  const invalidate = useInvalidateSafety();
  return useMutation({
    mutationFn: ({ id, ...body }: EndFireWatchInput & { id: string }) =>
      api<FireWatchRow>(`/safety/fire-watches/${id}/end`, { method: 'POST', body, idempotent: true }),
    onSuccess: invalidate,
  });
}
