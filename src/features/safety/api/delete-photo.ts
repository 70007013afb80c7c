import { useMutation } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { useInvalidateSafety } from './keys';

export function useDeletePhoto() {
  const invalidate = useInvalidateSafety();
  return useMutation({
    mutationFn: ({ id, photoId }: { id: string; photoId: string }) => api<void>(`/safety/procedures/${id}/photos/${photoId}`, { method: 'DELETE' }),
    onSuccess: invalidate,
  });
}
