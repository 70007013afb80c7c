import { useState } from 'react';
import type { WorkMove, WorkOrderDetail } from '../../../../shared/schemas/work-orders';
import { Button } from '../../../components/ui/button';
import { Notice } from '../../../components/ui/notice';
import { ConfirmDialog } from '../../../components/ui/confirm-dialog';
import { useMoveWorkOrder } from '../api/move-work-order';
import { inputClass } from './format';

/** Start, pause, resume or call off. Pausing and calling off ask why. */
export function WorkMoves({ wo }: { wo: WorkOrderDetail }) {
  const move = useMoveWorkOrder();
  const [asking, setAsking] = useState<WorkMove | null>(null);
  const [reason, setReason] = useState('');
  const [error, setError] = useState<string | null>(null);
  const go = async (m: WorkMove, why?: string) => {
    setError(null);
    try {
      await move.mutateAsync({ id: wo.id, move: m, ...(why ? { reason: why } : {}) });
      setAsking(null);
      setReason('');
    } catch (err) {
      setError(err instanceof Error ? err.message : 'Could not change the state');
    }
  };
  const can = (m: WorkMove) =>
    ({ start: wo.status === 'open', pause: wo.status === 'open' || wo.status === 'in-progress', resume: wo.status === 'on-hold', cancel: ['open', 'in-progress', 'on-hold'].includes(wo.status) })[m];
  return (
    <div className="flex flex-wrap items-center gap-2">
      {can('start') ? <Button onClick={() => go('start')} busy={move.isPending && move.variables?.move === 'start'}>Start work</Button> : null}
      {can('resume') ? <Button onClick={() => go('resume')} busy={move.isPending && move.variables?.move === 'resume'}>Resume</Button> : null}
      {can('pause') ? <Button variant="secondary" onClick={() => setAsking('pause')}>Pause</Button> : null}
      {can('cancel') ? <Button variant="secondary" onClick={() => setAsking('cancel')}>Call off</Button> : null}
      {error ? <Notice tone="danger" role="alert">{error}</Notice> : null}
      <ConfirmDialog
        open={asking !== null}
        title={asking === 'pause' ? `Pause WO ${wo.number}?` : `Call off WO ${wo.number}?`}
        confirmLabel={asking === 'pause' ? 'Pause' : 'Call off'}
        tone={asking === 'cancel' ? 'danger' : 'primary'}
        busy={move.isPending}
        onCancel={() => { setAsking(null); setError(null); }}
        onConfirm={() => asking && go(asking, reason.trim())}
      >
        <label htmlFor="move-reason" className="block text-sm font-semibold text-steel-800">
          {asking === 'pause' ? 'What is the work waiting for?' : 'Why is the work called off?'}
        </label>
        <input id="move-reason" className={inputClass} value={reason} onChange={(e) => setReason(e.target.value)} />
        {asking === 'cancel' && wo.plan ? <p className="mt-2 text-sm">Calling off planned work skips this occurrence; the plan schedules the next one from today.</p> : null}
        {error ? <p className="mt-2 text-sm font-semibold text-danger" role="alert">{error}</p> : null}
      </ConfirmDialog>
    </div>
  );
}
