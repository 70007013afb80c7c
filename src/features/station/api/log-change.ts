import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import { api } from '../../../lib/api-client';
import type { consumableChangeSchema } from '../../../../shared/schemas/consumables';
import { queryRoots } from '../../../lib/query-keys';
import { stationKeys } from './keys';

/** The change, and any scheduled work it signed off. */
export type LogChangeResult = { id: string; closed: number; opened: number; workOrders: { id: string; number: number }[] };

export type LogChangeInput = z.input<typeof consumableChangeSchema> & { photo?: File | null };

/** JSON for the common case; multipart with the details in `data` when a photo comes along. */
export function logChange({ photo, ...input }: LogChangeInput) {
  if (!photo) return api<LogChangeResult>('/consumable-changes', { method: 'POST', body: input, idempotent: true });
  const form = new FormData();
  form.append('data', JSON.stringify(input));
  form.append('photo', photo);
  return api<LogChangeResult>('/consumable-changes', { method: 'POST', body: form, idempotent: true });
}

/** A change moves life bars, counters and stock. */
export function useLogChange() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: logChange,
    onSuccess: () =>
      Promise.all([
        qc.invalidateQueries({ queryKey: stationKeys.all }),
        qc.invalidateQueries({ queryKey: queryRoots.stock }),
        qc.invalidateQueries({ queryKey: queryRoots.meters }),
        qc.invalidateQueries({ queryKey: queryRoots.consumableLife }),
        // A change may sign off a plan's work order and move the plan's next due.
        qc.invalidateQueries({ queryKey: queryRoots.workOrders }),
        qc.invalidateQueries({ queryKey: queryRoots.plans }),
      ]),
  });
}
