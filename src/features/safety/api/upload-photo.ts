import { useMutation } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { useInvalidateSafety } from './keys';

export function useUploadPhoto() {
  const invalidate = useInvalidateSafety();
  return useMutation({
    mutationFn: ({ id, file, sourceKey, caption }: { id: string; file: File; sourceKey: string; caption?: string }) => {
      const form = new FormData();
      form.set('sourceKey', sourceKey);
      if (caption) form.set('caption', caption);
      form.set('photo', file);
      return api<{ id: string }>(`/safety/procedures/${id}/photos`, { method: 'POST', body: form });
    },
    onSuccess: invalidate,
  });
}
