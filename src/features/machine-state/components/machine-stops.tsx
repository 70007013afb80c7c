import { useState } from 'react';
import { Link } from 'react-router-dom';
import { Button } from '../../../components/ui/button';
import { EmptyState, FormMessages } from '../../../components/ui/notice';
import { ApiError } from '../../../lib/api-client';
import { useShopFormat } from '../../../lib/format';
import { paths } from '../../../config/paths';
import { DOWNTIME_KIND_LABELS, DOWNTIME_KINDS, type DowntimeKind, type DowntimeRow } from '../../../../shared/schemas/machine-state';
import type { FailureCodeCategory } from '../../../../shared/schemas/failure-codes';
import { useFailureCodes } from '../api/get-reliability';
import { useCodeDowntime, useDowntimes, useTakeOutOfService } from '../api/change-state';
import { useMachineStatus } from '../api/get-status';
import { ReturnToServiceButton } from './return-to-service';

const input = 'mt-1 block min-h-touch w-full rounded border border-steel-400 bg-white px-3 font-normal';
const messageOf = (err: unknown, fallback: string) =>
  err instanceof ApiError && err.fields.length ? err.fields.map((f) => f.message).join('; ') : err instanceof Error ? err.message : fallback;

function CodeSelect({ stop, category, label }: { stop: DowntimeRow; category: FailureCodeCategory; label: string }) {
  const codes = useFailureCodes();
  const code = useCodeDowntime();
  const field = category === 'mode' ? 'failureCode' : category === 'cause' ? 'causeCode' : 'remedyCode';
  const current = stop[field];
  const options = (codes.data ?? []).filter((c) => c.category === category && (c.active || c.code === current));
  return (
    <label className="block text-sm font-semibold">
      {label}
      <select
        className={input}
        value={current ?? ''}
        aria-busy={code.isPending || undefined}
        onChange={(e) => code.mutate({ id: stop.id, [field]: e.target.value || null })}
      >
        <option value="">Not coded</option>
        {options.map((c) => (
          <option key={c.id} value={c.code}>
            {c.code} · {c.label}
          </option>
        ))}
      </select>
    </label>
  );
}

/**
 * A machine's stops: take it out of service for a planned stop or a failure found off the
 * station, return it, and code each stop with mode, cause and remedy for the reliability figures.
 */
export function MachineStops({ code, canChange }: { code: string; canChange: boolean }) {
  const f = useShopFormat();
  const status = useMachineStatus(code);
  const stops = useDowntimes(code);
  const take = useTakeOutOfService(code);
  const [kind, setKind] = useState<DowntimeKind>('planned');
  const [reason, setReason] = useState('');
  const [error, setError] = useState<string | null>(null);
  const stopNow = async (e: React.FormEvent) => {
    e.preventDefault();
    setError(null);
    try {
      await take.mutateAsync({ reason, kind });
      setReason('');
    } catch (err) {
      setError(messageOf(err, 'The machine was not taken out of service'));
    }
  };
  const inService = status.data?.state === 'in-service';
  return (
    <div className="space-y-4">
      {canChange && inService ? (
        <form onSubmit={stopNow} noValidate aria-label={`Take ${code} out of service`} className="grid items-end gap-3 md:grid-cols-[14rem_1fr_auto]">
          <label className="block text-sm font-semibold">
            Kind of stop
            <select className={input} value={kind} onChange={(e) => setKind(e.target.value as DowntimeKind)}>
              {DOWNTIME_KINDS.map((k) => (
                <option key={k} value={k}>
                  {DOWNTIME_KIND_LABELS[k]}
                </option>
              ))}
            </select>
          </label>
          <label className="block text-sm font-semibold">
            Why
            <input className={input} value={reason} onChange={(e) => setReason(e.target.value)} autoComplete="off" />
          </label>
          <Button type="submit" variant="danger" busy={take.isPending}>
            Take out of service
          </Button>
          <div className="md:col-span-3">
            <FormMessages error={error} />
          </div>
        </form>
      ) : null}
      {canChange && status.data?.state === 'out-of-service' ? <ReturnToServiceButton code={code} /> : null}
      {stops.data && stops.data.length === 0 ? <EmptyState title={`No stops recorded for ${code}`} /> : null}
      {stops.data && stops.data.length > 0 ? (
        <ol className="space-y-3" aria-label={`Stops of ${code}, newest first`}>
          {stops.data.map((s) => (
            <li key={s.id} className="rounded border border-steel-200 p-3">
              <p className="font-semibold">
                {DOWNTIME_KIND_LABELS[s.kind]}: {s.reason}
              </p>
              <p className="text-sm text-steel-700">
                From {f.dateTime(s.startedAt)}
                {s.startedBy ? ` (${s.startedBy})` : ''} to{' '}
                {s.endedAt ? `${f.dateTime(s.endedAt)}${s.endedBy ? ` (${s.endedBy})` : ''}` : 'now — still stopped'}
                {s.workOrderId ? (
                  <>
                    {' · '}
                    <Link className="underline" to={paths.workOrder.getHref(s.workOrderId)}>
                      its repair
                    </Link>
                  </>
                ) : null}
              </p>
              {canChange && s.kind === 'failure' ? (
                <div className="mt-2 grid gap-3 md:grid-cols-3">
                  <CodeSelect stop={s} category="mode" label="Failure mode" />
                  <CodeSelect stop={s} category="cause" label="Cause" />
                  <CodeSelect stop={s} category="remedy" label="Remedy" />
                </div>
              ) : null}
            </li>
          ))}
        </ol>
      ) : null}
    </div>
  );
}
