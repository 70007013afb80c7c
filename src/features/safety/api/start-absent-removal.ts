import { useMutation } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { StartAbsentRemovalInput } from '../../../../shared/schemas/safety-absent-removal';
import { useInvalidateSafetyAndWorkOrders } from './keys';

/** POST /safety/lockouts/:id/absent-removals — step 1, absence verified. */
export function useStartAbsentRemoval() {
  const invalidate = useInvalidateSafetyAndWorkOrders();
  return useMutation({
    mutationFn: ({ lockoutId, body }: { lockoutId: string; body: StartAbsentRemovalInput }) =>
      api<{ id: string; signOffId: string }>(`/safety/lockouts/${lockoutId}/absent-removals`, { method: 'POST', body }),
    onSuccess: invalidate,
  });
}
