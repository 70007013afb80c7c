import { useMutation } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { InspectionInput } from '../../../../shared/schemas/safety-records';
import { useInvalidateSafety } from './keys';

export function useRecordInspection() {
  const invalidate = useInvalidateSafety();
  return useMutation({
    mutationFn: (input: InspectionInput) => api<{ id: string }>('/safety/inspections', { method: 'POST', body: input, idempotent: true }),
    onSuccess: invalidate,
  });
}
