import { useMutation } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { SafetySettings, SafetySettingsView } from '../../../../shared/schemas/safety-records';
import { useInvalidateSafety } from './keys';

export function useUpdateSafetySettings() {
  const invalidate = useInvalidateSafety();
  return useMutation({
    mutationFn: (input: SafetySettings) => api<SafetySettingsView>('/safety/settings', { method: 'PUT', body: input }),
    onSuccess: invalidate,
  });
}
