import { useState } from 'react';
import { Link } from 'react-router-dom';
import type { ChecklistLine, WorkOrderDetail } from '../../../../shared/schemas/work-orders';
import { can, type Role } from '../../../../shared/permissions';
import { Button } from '../../../components/ui/button';
import { ConfirmDialog } from '../../../components/ui/confirm-dialog';
import { FormMessages, Notice } from '../../../components/ui/notice';
import { paths } from '../../../config/paths';
import { useShopFormat } from '../../../lib/format';
import { ApiError } from '../../../lib/api-client';
import { useRaiseRepairForCheck, useSignDeviation } from '../api/failed-check-follow-up';

const area = 'mt-1 block min-h-24 w-full rounded border border-steel-400 bg-white px-3 py-2 text-base font-normal';
const field = 'mt-1 block min-h-touch w-full max-w-sm rounded border border-steel-400 bg-white px-3 py-2 text-base font-normal';

function DeviationForm({ wo, line }: { wo: WorkOrderDetail; line: ChecklistLine }) {
  const sign = useSignDeviation();
  const [justification, setJustification] = useState('');
  const [password, setPassword] = useState('');
  const [error, setError] = useState<string | null>(null);
  const submit = async (e: React.FormEvent) => {
    e.preventDefault();
    setError(null);
    try {
      await sign.mutateAsync({ id: wo.id, key: line.key, justification, password });
    } catch (err) {
      // The server names the field at fault (too short a justification, no password).
      setError(
        err instanceof ApiError && err.fields.length
          ? err.fields.map((f) => f.message).join('; ')
          : err instanceof Error
            ? err.message
            : 'The deviation was not signed',
      );
    }
  };
  return (
    <form onSubmit={submit} noValidate aria-label={`Deviation for “${line.label}”`} className="mt-3 space-y-3 rounded border border-steel-300 bg-white p-3">
      <label className="block font-semibold" htmlFor={`dev-${line.key}`}>
        Why the machine may run, and under which measures
        <textarea id={`dev-${line.key}`} className={area} value={justification} onChange={(e) => setJustification(e.target.value)} />
      </label>
      <label className="block font-semibold" htmlFor={`dev-${line.key}-password`}>
        Your password, to sign the deviation
        <input
          id={`dev-${line.key}-password`}
          type="password"
          autoComplete="current-password"
          className={field}
          value={password}
          onChange={(e) => setPassword(e.target.value)}
        />
      </label>
      <FormMessages error={error} />
      <Button type="submit" busy={sign.isPending}>
        Sign the deviation
      </Button>
    </form>
  );
}

function FollowUpDone({ line }: { line: ChecklistLine }) {
  const f = useShopFormat();
  const up = line.followUp!;
  return up.kind === 'repair' ? (
    <p>
      Repair raised by {up.by}, {f.dateTime(up.at)}:{' '}
      <Link className="font-semibold underline" to={paths.workOrder.getHref(up.workOrderId)}>
        WO {up.number}
      </Link>
      . The machine stays out of service until that repair is signed off.
    </p>
  ) : (
    <p>
      Deviation signed by {up.by}, {f.dateTime(up.at)}: “{up.justification}”
    </p>
  );
}

/**
 * A safety-critical line answered Not OK blocks the sign-off until it is followed up: a technician
 * raises the repair (the machine goes out of service until it is done), or the safety officer signs
 * a justified deviation.
 */
export function FailedSafetyChecks({ wo, role, open }: { wo: WorkOrderDetail; role: Role; open: boolean }) {
  const lines = wo.checklist.filter((c) => c.safetyCritical && c.result === 'fail');
  const raise = useRaiseRepairForCheck();
  const [asking, setAsking] = useState<ChecklistLine | null>(null);
  const [deviating, setDeviating] = useState<string | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [raised, setRaised] = useState<string | null>(null);
  if (!lines.length) return null;
  const confirmRaise = async () => {
    if (!asking) return;
    setError(null);
    try {
      const repair = await raise.mutateAsync({ id: wo.id, key: asking.key });
      setRaised(`Repair WO ${repair.number} raised; ${wo.machine.code} is out of service until it is signed off.`);
    } catch (err) {
      setError(err instanceof Error ? err.message : 'The repair was not raised');
    }
    setAsking(null);
  };
  return (
    <section aria-labelledby="failed-safety-checks" className="mt-4 space-y-3">
      <h3 id="failed-safety-checks" className="text-lg font-bold text-danger-ink">
        Safety-critical checks not OK
      </h3>
      <FormMessages error={error} saved={raised} />
      <ul className="space-y-3">
        {lines.map((line) => (
          <li key={line.key}>
            <Notice tone={line.followUp ? 'caution' : 'danger'} title={line.label}>
              {line.followUp ? (
                <FollowUpDone line={line} />
              ) : (
                <>
                  <p>
                    This work cannot be signed off until this line is followed up: raise the repair (the machine is taken out of service until it is done), or
                    the safety officer signs a deviation saying why it may run.
                  </p>
                  {open ? (
                    <div className="mt-2 flex flex-wrap gap-2">
                      {can(role, 'work-orders.work') ? (
                        <Button variant="danger" onClick={() => setAsking(line)}>
                          Raise the repair
                        </Button>
                      ) : null}
                      {can(role, 'safety.deviation.sign') ? (
                        <Button
                          variant="secondary"
                          aria-expanded={deviating === line.key}
                          onClick={() => setDeviating(deviating === line.key ? null : line.key)}
                        >
                          Sign a deviation
                        </Button>
                      ) : null}
                    </div>
                  ) : null}
                  {open && deviating === line.key && can(role, 'safety.deviation.sign') ? <DeviationForm wo={wo} line={line} /> : null}
                </>
              )}
            </Notice>
          </li>
        ))}
      </ul>
      <ConfirmDialog
        open={asking !== null}
        title={`Raise the repair and stop ${wo.machine.code}?`}
        confirmLabel="Raise the repair"
        tone="danger"
        busy={raise.isPending}
        onConfirm={confirmRaise}
        onCancel={() => setAsking(null)}
      >
        <p>
          “{asking?.label}” failed. {wo.machine.code} is taken out of service now, and back in service when the repair work is signed off.
        </p>
      </ConfirmDialog>
    </section>
  );
}
