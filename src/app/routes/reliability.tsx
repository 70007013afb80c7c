import { useSearchParams } from 'react-router-dom';
import { DateTime } from 'luxon';
import { PageTitle } from '../../components/layout/app-shell';
import { useMachines } from '../../features/machines/api/get-machines';
import { useFailureCodes } from '../../features/machine-state/api/get-reliability';
import { ReliabilityView } from '../../features/machine-state/components/reliability-view';
import { FailureCodesEditor } from '../../features/machine-state/components/failure-codes-editor';
import { Panel } from '../../components/ui/notice';
import { useMe } from '../../features/auth/api/get-me';
import { can } from '../../../shared/permissions';
import { useShopFormat } from '../../lib/format';

const input = 'block min-h-touch w-full rounded border border-steel-400 bg-white px-3';

/** Reliability per machine and per failure mode over a chosen window. */
export function Component() {
  const [params, setParams] = useSearchParams();
  const { data: me } = useMe();
  const machines = useMachines({});
  const codes = useFailureCodes();
  const today = useShopFormat().today();
  const from = params.get('from') ?? DateTime.fromISO(today).minus({ days: 29 }).toISODate()!;
  const to = params.get('to') ?? today;
  const machineId = params.get('machine') ?? '';
  const failureCode = params.get('code') ?? '';
  const set = (k: string, v: string) => {
    const next = new URLSearchParams(params);
    if (v) next.set(k, v);
    else next.delete(k);
    setParams(next, { replace: true });
  };
  return (
    <>
      <PageTitle title="Reliability" subtitle="Failures, operating time, MTBF, MTTR and availability from the recorded stops." />
      <div className="mb-4 grid gap-3 sm:grid-cols-4">
        <label>
          <span className="font-semibold">From</span>
          <input type="date" className={input} value={from} onChange={(e) => set('from', e.target.value)} />
        </label>
        <label>
          <span className="font-semibold">To</span>
          <input type="date" className={input} value={to} onChange={(e) => set('to', e.target.value)} />
        </label>
        <label>
          <span className="font-semibold">Machine</span>
          <select className={input} value={machineId} onChange={(e) => set('machine', e.target.value)}>
            <option value="">All machines</option>
            {(machines.data ?? []).map((m) => (
              <option key={m.id} value={m.id}>
                {m.code} {m.name}
              </option>
            ))}
          </select>
        </label>
        <label>
          <span className="font-semibold">Failure mode</span>
          <select className={input} value={failureCode} onChange={(e) => set('code', e.target.value)}>
            <option value="">All failures</option>
            {(codes.data ?? [])
              .filter((c) => c.category === 'mode')
              .map((c) => (
                <option key={c.id} value={c.code}>
                  {c.code} {c.label}
                </option>
              ))}
          </select>
        </label>
      </div>
      <ReliabilityView filters={{ from, to, machineId: machineId || undefined, failureCode: failureCode || undefined }} />
      {me && can(me.role, 'failure-codes.manage') ? (
        <Panel title="Failure, cause and remedy codes" className="mt-4">
          <details>
            <summary className="inline-flex min-h-touch cursor-pointer items-center font-semibold underline">Edit the shop’s codes</summary>
            <div className="mt-3">
              <FailureCodesEditor />
            </div>
          </details>
        </Panel>
      ) : null}
    </>
  );
}
