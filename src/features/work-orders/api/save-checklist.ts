import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import {
  checklistBlockerText,
  type ChecklistLine,
  type ChecklistResultsInput,
  type CloseBlocker,
  type WorkOrderDetail,
} from '../../../../shared/schemas/work-orders';
import { getWorkOrderQueryOptions } from './get-work-order';
import { workOrderKeys } from './keys';

export const saveChecklist = ({ id, ...input }: ChecklistResultsInput & { id: string }) =>
  api<{ checklist: ChecklistLine[] }>(`/work-orders/${id}/checklist`, { method: 'PUT', body: input });

/** Recounts the `checklist_incomplete` blocker from the lines shown. */
function withChecklist(wo: WorkOrderDetail, checklist: ChecklistLine[]): WorkOrderDetail {
  const unanswered = checklist.filter((c) => c.result === null);
  const others = wo.closeBlockers.filter((b) => b.code !== 'checklist_incomplete');
  const line: CloseBlocker[] = unanswered.length ? [{ code: 'checklist_incomplete', message: checklistBlockerText(unanswered, checklist.length) }] : [];
  return { ...wo, checklist, closeBlockers: wo.closeBlockers.length || line.length ? [...line, ...others] : wo.closeBlockers };
}

/** Saves the given lines; the work order on screen shows the answers at once and goes back if the save fails. */
export function useSaveChecklist() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: saveChecklist,
    onMutate: async ({ id, results }) => {
      const key = getWorkOrderQueryOptions(id).queryKey;
      await qc.cancelQueries({ queryKey: key });
      const before = qc.getQueryData(key);
      if (before) {
        const checklist = before.checklist.map((c) => {
          const r = results.find((x) => x.key === c.key);
          return r ? { ...c, result: r.result, value: c.kind === 'measure' ? r.value : null, note: r.note } : c;
        });
        qc.setQueryData(key, withChecklist(before, checklist));
      }
      return { before, key };
    },
    onError: (_err, _vars, ctx) => {
      if (ctx?.before) qc.setQueryData(ctx.key, ctx.before);
    },
    onSettled: () => qc.invalidateQueries({ queryKey: workOrderKeys.all }),
  });
}
