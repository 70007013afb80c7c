import { useLockoutAction } from './lockout-actions';
import type { OfferHandoverInput } from '../../../../shared/schemas/safety-lockout';

/** POST /safety/lockouts/:id/handover */
export function useOfferHandover() {
  const m = useLockoutAction('handover');
  return { ...m, mutateAsync: (v: { id: string; body: OfferHandoverInput }) => m.mutateAsync(v) };
}
