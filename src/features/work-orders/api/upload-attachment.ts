import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { workOrderKeys } from './keys';

export const uploadAttachment = ({ id, file }: { id: string; file: File }) => {
  const body = new FormData();
  body.append('file', file);
  return api<{ id: string }>(`/work-orders/${id}/attachments`, { method: 'POST', body });
};

export function useUploadAttachment() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: uploadAttachment, onSuccess: () => qc.invalidateQueries({ queryKey: workOrderKeys.all }) });
}
