import { useMutation } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { ReapplyAfterTestInput } from '../../../../shared/schemas/safety-testing-window';
import { useInvalidateSafetyAndWorkOrders } from './keys';

/** POST /safety/lockouts/:id/test-windows/reapply — devices back on after testing (1910.147(f)(1)(v)). */
export function useReapplyAfterTest() {
  const invalidate = useInvalidateSafetyAndWorkOrders();
  return useMutation({
    mutationFn: ({ id, body }: { id: string; body: ReapplyAfterTestInput }) =>
      api<{ signOffId: string }>(`/safety/lockouts/${id}/test-windows/reapply`, { method: 'POST', body, idempotent: true }),
    onSuccess: invalidate,
  });
}
