import { useState } from 'react';
import type { WorkOrderDetail } from '../../../../shared/schemas/work-orders';
import { Button } from '../../../components/ui/button';
import { Notice } from '../../../components/ui/notice';
import { announce, focusSoon } from '../../../components/ui/live-region';
import { mainHeading } from '../../../components/ui/modal';
import { useCloseWorkOrder } from '../api/close-work-order';
import { useShopFormat } from '../../../lib/format';

/** Sign-off: only when the checklist is complete and, where required, the lockout is released. */
export function CloseWork({ wo }: { wo: WorkOrderDetail }) {
  const f = useShopFormat();
  const close = useCloseWorkOrder();
  const [message, setMessage] = useState<{ tone: 'danger' | 'safe'; text: string } | null>(null);
  // Safety work is signed like the safety log's records: the signer types their password again.
  const [password, setPassword] = useState('');
  const signOff = async () => {
    setMessage(null);
    if (wo.safetyCritical && !password) {
      setMessage({ tone: 'danger', text: 'Safety work is signed with your password: enter it to sign off.' });
      document.getElementById('signoff-password')?.focus();
      return;
    }
    try {
      const r = await close.mutateAsync({ id: wo.id, ...(wo.safetyCritical ? { password } : {}) });
      setPassword('');
      const text = r.planNextDueAt ? `Signed off. The plan is next due ${f.dateTime(r.planNextDueAt)}.` : 'Signed off.';
      setMessage({ tone: 'safe', text });
      // This panel goes away with the open work: the page's announcer says it, and focus goes to the record of the sign-off.
      announce(text);
      focusSoon(() => document.getElementById('work-signed-off') ?? mainHeading());
    } catch (err) {
      setMessage({ tone: 'danger', text: err instanceof Error ? err.message : 'Could not sign off' });
    }
  };
  return (
    <div className="space-y-3">
      {wo.closeBlockers.length ? (
        <Notice tone="caution" title="Before you can sign off">
          <ul className="list-disc pl-5">
            {wo.closeBlockers.map((b) => (
              <li key={b.code}>{b.message}</li>
            ))}
          </ul>
        </Notice>
      ) : (
        <Notice tone="safe" title="Ready to sign off">
          Checklist complete{wo.requiresLockout ? ' and lockout released' : ''}.
        </Notice>
      )}
      {wo.safetyCritical ? (
        <label className="block max-w-sm font-semibold" htmlFor="signoff-password">
          Your password, to sign this safety work
          <input
            id="signoff-password"
            type="password"
            autoComplete="current-password"
            value={password}
            onChange={(e) => setPassword(e.target.value)}
            className="mt-1 block min-h-touch w-full rounded border border-steel-400 bg-white px-3 py-2 text-base font-normal"
          />
        </label>
      ) : null}
      <Button onClick={signOff} busy={close.isPending} disabled={wo.closeBlockers.length > 0} aria-describedby="signoff-help">
        Sign off the work
      </Button>
      <p id="signoff-help" className="text-sm text-steel-600">
        Signing off records you as the person who finished the work, with the time, checklist answers, parts and time spent.
      </p>
      {message?.tone === 'danger' ? (
        <Notice tone="danger" role="alert">
          {message.text}
        </Notice>
      ) : null}
    </div>
  );
}
