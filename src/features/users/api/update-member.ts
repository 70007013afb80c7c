import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { UpdateMemberInput } from '../../../../shared/schemas/users';
import { userKeys } from './keys';

export function useUpdateMember() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ id, ...input }: UpdateMemberInput & { id: string }) => api<{ ok: true }>(`/users/${id}`, { method: 'PATCH', body: input }),
    onSuccess: () => qc.invalidateQueries({ queryKey: userKeys.all }),
  });
}

/** A fresh invitation link for someone who has not accepted yet (earlier links stop working). */
export function useResendInvitation() {
  return useMutation({
    mutationFn: (membershipId: string) => api<{ ok: true }>(`/users/${membershipId}/resend-invitation`, { method: 'POST' }),
  });
}
