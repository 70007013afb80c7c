import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import { api } from '../../../lib/api-client';
import type { partTypeUpdateSchema } from '../../../../shared/schemas/stock';
import { stockKeys } from './keys';

export const updatePartType = ({ id, ...input }: z.input<typeof partTypeUpdateSchema> & { id: string }) =>
  api<{ ok: true }>(`/part-types/${id}`, { method: 'PATCH', body: input });

export function useUpdatePartType() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: updatePartType, onSuccess: () => qc.invalidateQueries({ queryKey: stockKeys.all }) });
}
