import { useState } from 'react';
import type { WorkOrderDetail } from '../../../../shared/schemas/work-orders';
import { ROLE_LABELS } from '../../../../shared/permissions';
import { Button } from '../../../components/ui/button';
import { Notice } from '../../../components/ui/notice';
import { useUpdateWorkOrder } from '../api/update-work-order';
import { useLookups } from '../../../lib/lookups';
import { inputClass } from './format';
import { useShopInput } from '../../../lib/shop-time';

/** Name who does the work and when it is needed by. */
export function ReplanForm({ wo }: { wo: WorkOrderDetail }) {
  const input = useShopInput();
  const update = useUpdateWorkOrder();
  const lookups = useLookups();
  const [assignee, setAssignee] = useState(wo.assignee?.id ?? '');
  const [due, setDue] = useState(input.toLocalInput(wo.dueAt));
  const [message, setMessage] = useState<{ tone: 'danger' | 'safe'; text: string } | null>(null);
  const save = async (e: React.FormEvent) => {
    e.preventDefault();
    setMessage(null);
    try {
      await update.mutateAsync({ id: wo.id, assigneeId: assignee || null, dueAt: input.fromLocalInput(due) });
      setMessage({ tone: 'safe', text: 'Saved.' });
    } catch (err) {
      setMessage({ tone: 'danger', text: err instanceof Error ? err.message : 'Could not save' });
    }
  };
  return (
    <form onSubmit={save} aria-label="Who and when" className="grid gap-3 sm:grid-cols-[1fr_1fr_auto] sm:items-end">
      <div>
        <label htmlFor="wo-assignee" className="block text-sm font-semibold">
          Person doing it
        </label>
        <select id="wo-assignee" className={inputClass} value={assignee} onChange={(e) => setAssignee(e.target.value)}>
          <option value="">{wo.responsibleRole ? `Any ${ROLE_LABELS[wo.responsibleRole].toLowerCase()}` : 'No one named'}</option>
          {(lookups.data?.people ?? []).map((p) => (
            <option key={p.userId} value={p.userId}>
              {p.name} ({ROLE_LABELS[p.role]})
            </option>
          ))}
        </select>
      </div>
      <div>
        <label htmlFor="wo-due" className="block text-sm font-semibold">
          Needed by (site time)
        </label>
        <input id="wo-due" type="datetime-local" className={inputClass} value={due} onChange={(e) => setDue(e.target.value)} />
      </div>
      <Button type="submit" variant="secondary" busy={update.isPending}>
        Save
      </Button>
      {message ? (
        <div className="sm:col-span-3">
          <Notice tone={message.tone} role={message.tone === 'danger' ? 'alert' : 'status'}>
            {message.text}
          </Notice>
        </div>
      ) : null}
    </form>
  );
}
