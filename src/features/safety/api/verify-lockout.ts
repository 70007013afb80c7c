import { useLockoutAction } from './lockout-actions';
import type { VerifyLockoutInput } from '../../../../shared/schemas/safety-lockout';

/** POST /safety/lockouts/:id/verify */
export function useVerifyLockout() {
  const m = useLockoutAction('verify');
  return { ...m, mutateAsync: (v: { id: string; body: VerifyLockoutInput }) => m.mutateAsync(v) };
}
