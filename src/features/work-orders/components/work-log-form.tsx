import { useState } from 'react';
import type { WorkOrderDetail } from '../../../../shared/schemas/work-orders';
import { Button } from '../../../components/ui/button';
import { LiveNotice } from '../../../components/ui/live-region';
import { useUpdateWorkOrder } from '../api/update-work-order';
import { inputClass } from './format';
import { ApiError } from '../../../lib/api-client';

/** Time spent and notes; kept as the work goes on, and offered again at sign-off. */
export function WorkLogForm({ wo, readOnly }: { wo: WorkOrderDetail; readOnly: boolean }) {
  const update = useUpdateWorkOrder();
  const [minutes, setMinutes] = useState(String(wo.labourMinutes || ''));
  const [notes, setNotes] = useState(wo.notes);
  const [message, setMessage] = useState<{ tone: 'danger' | 'safe'; text: string } | null>(null);
  const [minutesError, setMinutesError] = useState<string | null>(null);
  const save = async (e: React.FormEvent) => {
    e.preventDefault();
    setMessage(null);
    setMinutesError(null);
    const n = minutes.trim() === '' ? 0 : Number(minutes);
    if (!Number.isInteger(n) || n < 0)
      return setMinutesError(n < 0 ? 'Cannot be negative: enter whole minutes, 0 or more.' : 'Enter whole minutes, 0 or more.');
    try {
      await update.mutateAsync({ id: wo.id, labourMinutes: n, notes });
      setMessage({ tone: 'safe', text: 'Saved.' });
    } catch (err) {
      const onField = err instanceof ApiError ? err.fields.find((f) => f.path === 'labourMinutes') : undefined;
      if (onField) setMinutesError(onField.message);
      else setMessage({ tone: 'danger', text: err instanceof Error ? err.message : 'Could not save' });
    }
  };
  return (
    <form onSubmit={save} aria-label="Time and notes" className="grid gap-3 sm:grid-cols-[12rem_1fr]">
      <div>
        <label htmlFor="wo-minutes" className="block text-sm font-semibold">
          Time spent (minutes)
        </label>
        <input
          id="wo-minutes"
          inputMode="numeric"
          className={inputClass}
          value={minutes}
          disabled={readOnly}
          aria-invalid={minutesError ? true : undefined}
          aria-describedby={minutesError ? 'wo-minutes-error' : undefined}
          onChange={(e) => {
            setMinutes(e.target.value);
            setMinutesError(null);
          }}
        />
        {minutesError ? (
          <p id="wo-minutes-error" className="mt-1 text-sm font-semibold text-danger" role="alert">
            {minutesError}
          </p>
        ) : null}
      </div>
      <div>
        <label htmlFor="wo-notes" className="block text-sm font-semibold">
          Notes
        </label>
        <textarea id="wo-notes" rows={3} className={inputClass} value={notes} disabled={readOnly} onChange={(e) => setNotes(e.target.value)} />
      </div>
      {readOnly ? null : (
        <div className="sm:col-span-2">
          <Button type="submit" variant="secondary" busy={update.isPending}>
            Save time and notes
          </Button>
        </div>
      )}
      {/* Focus stays on the save button (it is never disabled while saving); the result is announced. */}
      <LiveNotice className="sm:col-span-2" message={message} />
    </form>
  );
}
