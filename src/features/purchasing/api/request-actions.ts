import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { queryRoots } from '../../../lib/query-keys';
import { purchasingKeys } from './keys';

export type RequestAction =
  | { kind: 'raise'; partTypeId: string; quantity: number }
  | { kind: 'approve' | 'order' | 'cancel'; id: string }
  | { kind: 'receive'; id: string; quantity: number };

export function runRequestAction(a: RequestAction) {
  if (a.kind === 'raise')
    return api<{ id: string; number: number }>('/purchase-requests', { method: 'POST', body: { partTypeId: a.partTypeId, quantity: a.quantity } });
  if (a.kind === 'receive') return api(`/purchase-requests/${a.id}/receipts`, { method: 'POST', body: { quantity: a.quantity } });
  return api(`/purchase-requests/${a.id}/${a.kind}`, { method: 'POST', body: {} });
}

/** Orders and receipts change stock figures too, shown on the stock and station pages. */
export function useRequestAction() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: runRequestAction,
    onSuccess: () =>
      Promise.all([
        qc.invalidateQueries({ queryKey: purchasingKeys.all }),
        qc.invalidateQueries({ queryKey: queryRoots.stock }),
        qc.invalidateQueries({ queryKey: queryRoots.station }),
      ]),
  });
}
