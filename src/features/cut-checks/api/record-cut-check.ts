import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import { api } from '../../../lib/api-client';
import type { CutCheckRow, cutCheckSchema } from '../../../../shared/schemas/consumables';
import { queryRoots } from '../../../lib/query-keys';
import { cutCheckKeys } from './keys';

export const recordCutCheck = (input: z.input<typeof cutCheckSchema>) => api<CutCheckRow>('/cut-checks', { method: 'POST', body: input, idempotent: true });

/** The station page suggests a change after a failed coupon. */
export function useRecordCutCheck() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: recordCutCheck,
    onSuccess: () =>
      Promise.all([
        qc.invalidateQueries({ queryKey: cutCheckKeys.all }),
        qc.invalidateQueries({ queryKey: queryRoots.station }),
        // A coupon may sign off the plan's work order that names it.
        qc.invalidateQueries({ queryKey: queryRoots.workOrders }),
        qc.invalidateQueries({ queryKey: queryRoots.plans }),
      ]),
  });
}
