import { useMutation } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { useInvalidateSafety } from './keys';

export function useApproveVersion() {
  const invalidate = useInvalidateSafety();
  return useMutation({
    mutationFn: ({ id, version, password, retrainingRequired }: { id: string; version: number; password: string; retrainingRequired: boolean }) =>
      api<{ signOffId: string }>(`/safety/procedures/${id}/versions/${version}/approve`, {
        method: 'POST',
        body: { password, retrainingRequired },
        idempotent: true,
      }),
    onSuccess: invalidate,
  });
}
