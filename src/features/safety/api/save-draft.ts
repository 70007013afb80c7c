import { useMutation } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { ProcedureContent } from '../../../../shared/schemas/safety-procedures';
import { useInvalidateSafety } from './keys';

export function useSaveDraft() {
  const invalidate = useInvalidateSafety();
  return useMutation({
    mutationFn: ({ id, content }: { id: string; content: ProcedureContent }) =>
      api<{ versionId: string; version: number }>(`/safety/procedures/${id}/draft`, { method: 'PUT', body: content }),
    onSuccess: invalidate,
  });
}
