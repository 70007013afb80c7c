// One mutation per lockout action endpoint (verify, join, leave, hand-over, accept, release); they share a shape.
import { useMutation } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { useInvalidateSafetyAndWorkOrders } from './keys';

export type LockoutAction = 'verify' | 'join' | 'leave' | 'handover' | 'accept-handover' | 'release';

export function useLockoutAction(action: LockoutAction) {
  const invalidate = useInvalidateSafetyAndWorkOrders();
  return useMutation({
    mutationFn: ({ id, body }: { id: string; body: Record<string, unknown> & { password: string } }) =>
      api<{ signOffId: string }>(`/safety/lockouts/${id}/${action}`, { method: 'POST', body, idempotent: true }),
    onSuccess: invalidate,
  });
}
