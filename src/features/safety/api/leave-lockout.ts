import { useLockoutAction } from './lockout-actions';

/** POST /safety/lockouts/:id/leave */
export function useLeaveLockout() {
  const m = useLockoutAction('leave');
  return { ...m, mutateAsync: (v: { id: string; body: { password: string } }) => m.mutateAsync(v) };
}
