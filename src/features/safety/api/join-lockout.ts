import { useLockoutAction } from './lockout-actions';
import type { JoinLockoutInput } from '../../../../shared/schemas/safety-lockout';

/** POST /safety/lockouts/:id/join */
export function useJoinLockout() {
  const m = useLockoutAction('join');
  return { ...m, mutateAsync: (v: { id: string; body: JoinLockoutInput }) => m.mutateAsync(v) };
}
