import { useLockoutAction } from './lockout-actions';
import type { ReleaseLockoutInput } from '../../../../shared/schemas/safety-lockout';

/** POST /safety/lockouts/:id/release */
export function useReleaseLockout() {
  const m = useLockoutAction('release');
  return { ...m, mutateAsync: (v: { id: string; body: ReleaseLockoutInput }) => m.mutateAsync(v) };
}
