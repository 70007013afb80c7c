import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import { api } from '../../../lib/api-client';
import type { ReadingBatchResult, readingBatchSchema } from '../../../../shared/schemas/machines';
import { queryRoots } from '../../../lib/query-keys';
import { stationKeys } from './keys';

export const recordCounters = (input: z.input<typeof readingBatchSchema>) =>
  api<ReadingBatchResult>('/meter-readings', { method: 'POST', body: input, idempotent: true });

export function useRecordCounters() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: recordCounters,
    onSuccess: () =>
      Promise.all([
        qc.invalidateQueries({ queryKey: stationKeys.all }),
        qc.invalidateQueries({ queryKey: queryRoots.meters }),
        qc.invalidateQueries({ queryKey: queryRoots.punchTools }),
        // A reading may sign off the plan's work order that names it.
        qc.invalidateQueries({ queryKey: queryRoots.workOrders }),
        qc.invalidateQueries({ queryKey: queryRoots.plans }),
      ]),
  });
}
