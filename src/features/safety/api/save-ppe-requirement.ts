import { useMutation } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { PpeRequirementInput } from '../../../../shared/schemas/safety-ppe';
import { useInvalidateSafety } from './keys';

export function useSavePpeRequirement() {
  const invalidate = useInvalidateSafety();
  return useMutation({
    mutationFn: ({ id, input }: { id?: string; input: PpeRequirementInput }) =>
      api<{ id: string }>(id ? `/safety/ppe/requirements/${id}` : '/safety/ppe/requirements', { method: id ? 'PUT' : 'POST', body: input }),
    onSuccess: invalidate,
  });
}
