import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import { api } from '../../../lib/api-client';
import type { recordStockMoveSchema } from '../../../../shared/schemas/stock';
import { queryRoots } from '../../../lib/query-keys';
import { stockKeys } from './keys';

export const recordStockMove = (input: z.input<typeof recordStockMoveSchema>) =>
  api<{ id: string; onHand: number }>('/stock-moves', { method: 'POST', body: input });

/** Stock figures also show on station pages. */
export function useRecordStockMove() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: recordStockMove,
    onSuccess: () => Promise.all([qc.invalidateQueries({ queryKey: stockKeys.all }), qc.invalidateQueries({ queryKey: queryRoots.station })]),
  });
}
