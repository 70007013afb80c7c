import { useMutation } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { useInvalidateSafety } from './keys';

export function useCertifyInspection() {
  const invalidate = useInvalidateSafety();
  return useMutation({
    mutationFn: ({ id, password }: { id: string; password: string }) =>
      api<{ id: string }>(`/safety/inspections/${id}/certify`, { method: 'POST', body: { password }, idempotent: true }),
    onSuccess: invalidate,
  });
}
