import { useMutation } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { CorrectionInput } from '../../../../shared/schemas/safety-sign-offs';
import { useInvalidateSafety } from './keys';

export function useCorrectSignOff() {
  const invalidate = useInvalidateSafety();
  return useMutation({
    mutationFn: ({ id, ...body }: CorrectionInput & { id: string }) =>
      api<{ id: string; seq: number }>(`/safety/sign-offs/${id}/corrections`, { method: 'POST', body, idempotent: true }),
    onSuccess: invalidate,
  });
}
