import { useMutation } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { ReverifyAfterTestInput } from '../../../../shared/schemas/safety-testing-window';
import { useInvalidateSafetyAndWorkOrders } from './keys';

/** POST /safety/lockouts/:id/test-windows/reverify — zero energy verified again before work resumes. */
export function useReverifyAfterTest() {
  const invalidate = useInvalidateSafetyAndWorkOrders();
  return useMutation({
    mutationFn: ({ id, body }: { id: string; body: ReverifyAfterTestInput }) =>
      api<{ signOffId: string }>(`/safety/lockouts/${id}/test-windows/reverify`, { method: 'POST', body, idempotent: true }),
    onSuccess: invalidate,
  });
}
