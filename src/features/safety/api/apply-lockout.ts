import { useMutation } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { ApplyLockoutInput } from '../../../../shared/schemas/safety-lockout';
import { useInvalidateSafetyAndWorkOrders } from './keys';

export function useApplyLockout() {
  const invalidate = useInvalidateSafetyAndWorkOrders();
  return useMutation({
    mutationFn: (input: ApplyLockoutInput) => api<{ id: string; signOffId: string }>('/safety/lockouts', { method: 'POST', body: input, idempotent: true }),
    onSuccess: invalidate,
  });
}
