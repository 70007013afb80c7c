import { useMutation } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { AbsentStepInput } from '../../../../shared/schemas/safety-absent-removal';
import { useInvalidateSafetyAndWorkOrders } from './keys';

/** POST /safety/absent-removals/:id/steps — the next signed step of an absent employee's lock removal. */
export function useSignAbsentStep() {
  const invalidate = useInvalidateSafetyAndWorkOrders();
  return useMutation({
    mutationFn: ({ id, body }: { id: string; body: AbsentStepInput }) =>
      api<{ id: string; step: string; signOffId: string }>(`/safety/absent-removals/${id}/steps`, { method: 'POST', body }),
    onSuccess: invalidate,
  });
}
