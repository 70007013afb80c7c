import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import { api } from '../../../lib/api-client';
import type { readingInputSchema } from '../../../../shared/schemas/machines';
import { queryRoots } from '../../../lib/query-keys';
import { meterKeys } from './keys';

export const addReading = ({ meterId, ...input }: z.input<typeof readingInputSchema> & { meterId: string }) =>
  api<{ id: string }>(`/meters/${meterId}/readings`, { method: 'POST', body: input });

/** A new reading changes meter views and every page that shows latest counters. */
export function useAddReading() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: addReading,
    onSuccess: () =>
      Promise.all([
        qc.invalidateQueries({ queryKey: meterKeys.all }),
        qc.invalidateQueries({ queryKey: queryRoots.machines }),
        qc.invalidateQueries({ queryKey: queryRoots.station }),
      ]),
  });
}
