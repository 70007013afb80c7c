import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { ChecklistLine, ChecklistResultsInput } from '../../../../shared/schemas/work-orders';

export const saveChecklist = ({ id, ...input }: ChecklistResultsInput & { id: string }) =>
  api<{ checklist: ChecklistLine[] }>(`/work-orders/${id}/checklist`, { method: 'PUT', body: input });

export function useSaveChecklist() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: saveChecklist, onSuccess: () => qc.invalidateQueries({ queryKey: ['work-orders'] }) });
}
