import { useMutation } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { CreateProcedureInput } from '../../../../shared/schemas/safety-procedures';
import { useInvalidateSafety } from './keys';

export function useCreateProcedure() {
  const invalidate = useInvalidateSafety();
  return useMutation({
    mutationFn: (input: CreateProcedureInput) => api<{ id: string; versionId: string }>('/safety/procedures', { method: 'POST', body: input }),
    onSuccess: invalidate,
  });
}
