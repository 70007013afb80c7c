import { useState } from 'react';
import { Link } from 'react-router-dom';
import { Button } from '../../../components/ui/button';
import { Notice } from '../../../components/ui/notice';
import { TextField } from '../../../components/ui/field';
import { useReportFault } from '../api/change-state';
import { PHOTO_TYPES } from '../../../../shared/schemas/photos';
import type { FaultReportResult } from '../../../../shared/schemas/machine-state';

/** What operators most often see, each tied to a failure-mode code from the starter list: one tap picks both. */
const QUICK_FAULTS = [
  { label: 'Will not start', code: 'NOSTART' },
  { label: 'Stops while running', code: 'STOPS' },
  { label: 'Leaking', code: 'LEAK' },
  { label: 'Unusual noise or shaking', code: 'NOISE' },
  { label: 'Poor cut or punch quality', code: 'CUTQ' },
  { label: 'Guard or safety device fault', code: 'GUARD' },
  { label: 'Control or display fault', code: 'CTRL' },
  { label: 'Something else', code: 'OTHER' },
];

/**
 * Fault report at the machine in three taps: open, pick what is wrong, then stop the machine or
 * keep it running. A note and a photo are optional.
 */
export function FaultReport({ code, workOrderHref }: { code: string; workOrderHref: (id: string) => string }) {
  const [open, setOpen] = useState(false);
  const [picked, setPicked] = useState<(typeof QUICK_FAULTS)[number] | null>(null);
  const [note, setNote] = useState('');
  const [photo, setPhoto] = useState<File | null>(null);
  const [done, setDone] = useState<FaultReportResult | null>(null);
  const m = useReportFault(code);

  const send = (takeOutOfService: boolean) => {
    if (!picked && note.trim().length < 3) return;
    const description = [picked?.label, note.trim()].filter(Boolean).join(': ');
    m.mutate(
      { description, takeOutOfService, failureCode: picked?.code ?? null, photo },
      {
        onSuccess: (r) => {
          setDone(r);
          setOpen(false);
          setPicked(null);
          setNote('');
          setPhoto(null);
        },
      },
    );
  };

  if (!open)
    return (
      <div className="space-y-2">
        {done ? (
          <Notice tone="safe" role="status" title={`Fault reported: WO ${done.workOrderNumber}`}>
            {done.status.state === 'out-of-service' ? 'The machine is out of service and maintenance has been told.' : 'Maintenance has been told.'}{' '}
            <Link className="underline" to={workOrderHref(done.workOrderId)}>
              Open WO {done.workOrderNumber}
            </Link>
          </Notice>
        ) : null}
        <Button variant="danger" className="w-full text-lg" onClick={() => setOpen(true)}>
          Report a fault
        </Button>
      </div>
    );

  return (
    <section aria-label="Report a fault" className="space-y-3 rounded-lg border-2 border-danger bg-white p-4">
      <h2 className="text-xl font-bold">What is wrong?</h2>
      <div className="grid grid-cols-2 gap-2">
        {QUICK_FAULTS.map((f) => (
          <button
            key={f.code}
            type="button"
            aria-pressed={picked?.code === f.code}
            onClick={() => setPicked(f)}
            className={`min-h-touch rounded border px-3 py-2 text-left font-semibold ${picked?.code === f.code ? 'border-steel-900 bg-steel-800 text-white' : 'border-steel-400 bg-white'}`}
          >
            {f.label}
          </button>
        ))}
      </div>
      <TextField label="Note (optional)" value={note} maxLength={1500} onChange={(e) => setNote(e.target.value)} placeholder="Where, what you saw or heard" />
      <label className="block">
        <span className="font-semibold">Photo (optional)</span>
        <input
          type="file"
          accept={PHOTO_TYPES.join(',')}
          capture="environment"
          className="mt-1 block min-h-touch w-full"
          onChange={(e) => setPhoto(e.target.files?.[0] ?? null)}
        />
      </label>
      {m.isError ? (
        <Notice tone="danger" role="alert" title="Not sent">
          {m.error.message}
        </Notice>
      ) : null}
      <div className="grid gap-2 sm:grid-cols-2">
        <Button variant="danger" busy={m.isPending} disabled={!picked && note.trim().length < 3} onClick={() => send(true)}>
          Stop the machine and report
        </Button>
        <Button variant="secondary" busy={m.isPending} disabled={!picked && note.trim().length < 3} onClick={() => send(false)}>
          Report, keep running
        </Button>
      </div>
      <Button variant="ghost" onClick={() => setOpen(false)}>
        Cancel
      </Button>
    </section>
  );
}
