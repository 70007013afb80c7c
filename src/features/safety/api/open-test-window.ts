import { useMutation } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { OpenTestWindowInput } from '../../../../shared/schemas/safety-testing-window';
import { useInvalidateSafetyAndWorkOrders } from './keys';

/** POST /safety/lockouts/:id/test-windows — devices off for testing or positioning (1910.147(f)(1)(i)-(iii)). */
export function useOpenTestWindow() {
  const invalidate = useInvalidateSafetyAndWorkOrders();
  return useMutation({
    mutationFn: ({ id, body }: { id: string; body: OpenTestWindowInput }) =>
      api<{ id: string; signOffId: string }>(`/safety/lockouts/${id}/test-windows`, { method: 'POST', body, idempotent: true }),
    onSuccess: invalidate,
  });
}
