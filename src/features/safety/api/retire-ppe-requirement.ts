import { useMutation } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { useInvalidateSafety } from './keys';

export function useRetirePpeRequirement() {
  const invalidate = useInvalidateSafety();
  return useMutation({ mutationFn: (id: string) => api<void>(`/safety/ppe/requirements/${id}`, { method: 'DELETE' }), onSuccess: invalidate });
}
