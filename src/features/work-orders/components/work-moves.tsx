import { useRef, useState } from 'react';
import { Link } from 'react-router-dom';
import { paths } from '../../../config/paths';
import type { WorkMove, WorkOrderDetail } from '../../../../shared/schemas/work-orders';
import { Button } from '../../../components/ui/button';
import { Notice } from '../../../components/ui/notice';
import { ConfirmDialog } from '../../../components/ui/confirm-dialog';
import { mainHeading, useModal } from '../../../components/ui/modal';
import { announce, focusWhenGone } from '../../../components/ui/live-region';
import { ApiError } from '../../../lib/api-client';
import { useMoveWorkOrder } from '../api/move-work-order';
import { inputClass } from './format';

/** Start, pause, resume or call off. Pausing and calling off ask why. */
const MOVE_DONE: Record<WorkMove, string> = { start: 'Work started.', pause: 'Work paused.', resume: 'Work resumed.', cancel: 'Work called off.' };

export function WorkMoves({ wo }: { wo: WorkOrderDetail }) {
  const move = useMoveWorkOrder();
  const group = useRef<HTMLDivElement>(null);
  const [asking, setAsking] = useState<WorkMove | null>(null);
  const [reason, setReason] = useState('');
  const [error, setError] = useState<string | null>(null);
  const go = async (m: WorkMove, why?: string) => {
    setError(null);
    const pressed = document.activeElement;
    // Same rule as the server (3+ characters), said before a round trip and without the field path.
    if ((m === 'pause' || m === 'cancel') && (why ?? '').length < 3) {
      setError(
        m === 'pause' ? 'Say what the work is waiting for (a few words), then pause it.' : 'Say why the work is called off (a few words), then call it off.',
      );
      return;
    }
    try {
      await move.mutateAsync({ id: wo.id, move: m, ...(why ? { reason: why } : {}) });
      setAsking(null);
      setReason('');
      announce(MOVE_DONE[m]);
      // The pressed button goes away with the move (Start becomes Pause): focus goes to the next move, or the heading when none is left.
      focusWhenGone(pressed, () => group.current?.querySelector<HTMLElement>('button') ?? mainHeading());
    } catch (err) {
      setError(err instanceof ApiError && err.fields[0] ? err.fields[0].message : err instanceof Error ? err.message : 'Could not change the state');
    }
  };
  const needsLockout = wo.requiresLockout && !wo.lockoutSessionId && !wo.lockoutReleasedAt;
  const [warnLockout, setWarnLockout] = useState(false);
  const can = (m: WorkMove) =>
    ({
      start: wo.status === 'open',
      pause: wo.status === 'open' || wo.status === 'in-progress',
      resume: wo.status === 'on-hold',
      cancel: ['open', 'in-progress', 'on-hold'].includes(wo.status),
    })[m];
  return (
    <div ref={group} className="flex flex-wrap items-center gap-2">
      {can('start') ? (
        <Button onClick={() => (needsLockout ? setWarnLockout(true) : go('start'))} busy={move.isPending && move.variables?.move === 'start'}>
          Start work
        </Button>
      ) : null}
      {can('resume') ? (
        <Button onClick={() => go('resume')} busy={move.isPending && move.variables?.move === 'resume'}>
          Resume
        </Button>
      ) : null}
      {can('pause') ? (
        <Button
          variant="secondary"
          onClick={() => {
            setError(null);
            setAsking('pause');
          }}
        >
          Pause
        </Button>
      ) : null}
      {can('cancel') ? (
        <Button
          variant="secondary"
          onClick={() => {
            setError(null);
            setAsking('cancel');
          }}
        >
          Call off
        </Button>
      ) : null}
      {/* While the reason dialog is open its own message says it; one alert, not two. */}
      {error && asking === null ? (
        <Notice tone="danger" role="alert">
          {error}
        </Notice>
      ) : null}
      <LockoutFirstDialog
        open={warnLockout}
        lockoutHref={paths.safetyLockoutNew.getHref({ machineId: wo.machine.id, workOrderId: wo.id })}
        busy={move.isPending}
        onStartAnyway={async () => {
          await go('start');
          setWarnLockout(false);
        }}
        onCancel={() => setWarnLockout(false)}
      />
      <ConfirmDialog
        open={asking !== null}
        title={asking === 'pause' ? `Pause WO ${wo.number}?` : `Call off WO ${wo.number}?`}
        confirmLabel={asking === 'pause' ? 'Pause' : 'Call off'}
        // “Cancel” beside “Call off” reads as the same thing; name what the button keeps.
        cancelLabel={asking === 'pause' ? 'Keep working' : 'Keep the work'}
        tone={asking === 'cancel' ? 'danger' : 'primary'}
        busy={move.isPending}
        onCancel={() => {
          setAsking(null);
          setError(null);
        }}
        onConfirm={() => asking && go(asking, reason.trim())}
      >
        <label htmlFor="move-reason" className="block text-sm font-semibold text-steel-800">
          {asking === 'pause' ? 'What is the work waiting for?' : 'Why is the work called off?'}
        </label>
        <input
          id="move-reason"
          className={inputClass}
          value={reason}
          maxLength={500}
          required
          aria-invalid={error ? true : undefined}
          aria-describedby={error ? 'move-reason-error' : undefined}
          onChange={(e) => setReason(e.target.value)}
        />
        {asking === 'cancel' && wo.plan ? (
          <p className="mt-2 text-sm">Calling off planned work skips this occurrence; the plan schedules the next one from today.</p>
        ) : null}
        {error ? (
          <p id="move-reason-error" className="mt-2 text-sm font-semibold text-danger" role="alert">
            {error}
          </p>
        ) : null}
      </ConfirmDialog>
    </div>
  );
}

/** Caution before starting work that needs a lockout which is not applied yet. */
function LockoutFirstDialog({
  open,
  lockoutHref,
  busy,
  onStartAnyway,
  onCancel,
}: {
  open: boolean;
  lockoutHref: string;
  busy: boolean;
  onStartAnyway: () => void;
  onCancel: () => void;
}) {
  const ref = useRef<HTMLDialogElement>(null);
  useModal(ref, open);
  return (
    <dialog
      ref={ref}
      onCancel={(e) => {
        e.preventDefault();
        onCancel();
      }}
      aria-labelledby="lockout-first-title"
      className="m-auto w-[min(32rem,92vw)] rounded border-2 border-caution p-0 shadow-xl backdrop:bg-steel-950/50"
    >
      <div className="space-y-3 bg-caution-soft p-5 text-caution-ink">
        <h2 id="lockout-first-title" className="text-xl font-bold">
          <span aria-hidden="true">⚠ </span>Caution: lockout needed
        </h2>
        <p>
          This work needs a lockout first: isolate the machine under the site’s energy-control procedure before anyone works on it. No lockout is applied for
          this work yet.
        </p>
        <div className="flex flex-wrap justify-end gap-2 pt-2">
          <Button variant="secondary" onClick={onCancel}>
            Cancel
          </Button>
          <Button variant="secondary" busy={busy} onClick={onStartAnyway}>
            Start anyway
          </Button>
          <Link
            to={lockoutHref}
            className="inline-flex min-h-touch min-w-touch items-center justify-center rounded bg-steel-800 px-4 py-2 font-semibold text-white hover:bg-steel-700"
          >
            Lock out first
          </Link>
        </div>
      </div>
    </dialog>
  );
}
