import { useMutation } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { RegisterOutsidePartyInput } from '../../../../shared/schemas/safety-outside-personnel';
import { useInvalidateSafety } from './keys';

/** POST /safety/lockouts/:id/outside-parties — an outside crew on the lockout, procedures exchanged and signed. */
export function useRegisterOutsideParty() {
  const invalidate = useInvalidateSafety();
  return useMutation({
    mutationFn: ({ lockoutId, body }: { lockoutId: string; body: RegisterOutsidePartyInput }) =>
      api<{ id: string; signOffId: string }>(`/safety/lockouts/${lockoutId}/outside-parties`, { method: 'POST', body }),
    onSuccess: invalidate,
  });
}
