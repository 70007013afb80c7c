import { useLockoutAction } from './lockout-actions';
import type { AcceptHandoverInput } from '../../../../shared/schemas/safety-lockout';

/** POST /safety/lockouts/:id/accept-handover */
export function useAcceptHandover() {
  const m = useLockoutAction('accept-handover');
  return { ...m, mutateAsync: (v: { id: string; body: AcceptHandoverInput }) => m.mutateAsync(v) };
}
