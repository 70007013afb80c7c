import { useMutation } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type {
  AcknowledgeOutsideInput,
  InformOutsideInput,
  OutsideLocksAppliedInput,
  OutsideLocksRemovedInput,
} from '../../../../shared/schemas/safety-outside-personnel';
import { useInvalidateSafety } from './keys';

type StepCall =
  | { action: 'acknowledge'; body: AcknowledgeOutsideInput }
  | { action: 'inform'; body: InformOutsideInput }
  | { action: 'locks-on'; body: OutsideLocksAppliedInput }
  | { action: 'locks-off'; body: OutsideLocksRemovedInput };

/** POST /safety/outside-parties/:id/{acknowledge,inform,locks-on,locks-off} — the outside party's later signed steps. */
export function useSignOutsideStep() {
  const invalidate = useInvalidateSafety();
  return useMutation({
    mutationFn: ({ id, call }: { id: string; call: StepCall }) =>
      api<{ id: string; signOffId: string }>(`/safety/outside-parties/${id}/${call.action}`, { method: 'POST', body: call.body }),
    onSuccess: invalidate,
  });
}
