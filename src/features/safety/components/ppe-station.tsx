import { useEffect, useMemo, useRef, useState } from 'react';
import { Notice } from '../../../components/ui/notice';
import { Button } from '../../../components/ui/button';
import { WorkCaution } from '../../../components/ui/caution';
import { ApiError } from '../../../lib/api-client';
import type { Role } from '../../../../shared/permissions';
import type { PpeRequirementRow } from '../../../../shared/schemas/safety-ppe';
import { usePpeRequirements } from '../api/get-ppe-requirements';
import { useRecordPpeCheck } from '../api/record-ppe-check';
import { useSignFlow } from './sign-dialog';
import { NoiseVerdicts } from './noise-verdicts';
import { useShopFormat } from '../../../lib/format';

const big = 'flex min-h-16 w-full items-center justify-between gap-3 rounded border-2 px-4 py-3 text-left text-lg font-semibold';

/** The shift PPE check at the machine: pick the machine and task, tap each item once it is on, sign. */
export type PpeSigned = { machineCode: string; task: string; by: string; at: string };

export function PpeStation({
  me,
  initialMachineId,
  onSigned,
}: {
  me: { name: string; role: Role };
  initialMachineId?: string;
  /** Called once the check is signed, instead of showing the signed check here (e.g. to go back to the station). */
  onSigned?: (signed: PpeSigned) => void;
}) {
  const f = useShopFormat();
  const reqs = usePpeRequirements();
  const record = useRecordPpeCheck();
  const { sign, dialog } = useSignFlow(me);
  const machines = useMemo(() => {
    const map = new Map<string, { id: string; code: string; name: string; reqs: PpeRequirementRow[] }>();
    for (const r of reqs.data ?? []) {
      const m = map.get(r.machineId) ?? {
        id: r.machineId,
        code: r.machineCode,
        name: r.machineName,
        reqs: [],
      };
      m.reqs.push(r);
      map.set(r.machineId, m);
    }
    return [...map.values()];
  }, [reqs.data]);
  const [machineId, setMachineId] = useState(initialMachineId ?? '');
  const machine = machines.find((m) => m.id === machineId);
  const [reqId, setReqId] = useState('');
  const req = machine?.reqs.length === 1 ? machine.reqs[0] : machine?.reqs.find((r) => r.id === reqId);
  const [on, setOn] = useState<string[]>([]);
  /** After signing, the page shows only what was signed until a new check is started. */
  const [done, setDone] = useState<{
    machine: string;
    task: string;
    by: string;
    at: string;
    items: string[];
  } | null>(null);
  const [error, setError] = useState<string | null>(null);
  const missing = req ? req.required.filter((i) => !on.includes(i.code)) : [];
  const allOn = !!req && on.length > 0 && missing.length === 0;
  const signStep = useRef<HTMLDivElement>(null);
  // On a phone the sign button is far below the last item: bring it into view once everything is on.
  useEffect(() => {
    if (!allOn) return;
    const reduce = window.matchMedia?.('(prefers-reduced-motion: reduce)').matches;
    signStep.current?.scrollIntoView?.({
      block: 'nearest',
      behavior: reduce ? 'auto' : 'smooth',
    });
  }, [allOn]);

  const chooseMachine = (id: string) => {
    setMachineId(id);
    setReqId('');
    setOn([]);
    setDone(null);
  };

  if (reqs.isError) return <Notice tone="danger">{reqs.error.message}</Notice>;
  if (reqs.isLoading) return <p role="status">Loading…</p>;
  if (!machines.length)
    return (
      <Notice tone="caution" title="No PPE requirements yet">
        The safety officer has not set PPE requirements for any machine. Ask before you start.
      </Notice>
    );

  if (done)
    return (
      <section aria-labelledby="ppe-signed" className="space-y-4">
        <Notice tone="safe" role="status">
          <h2 id="ppe-signed" className="text-lg font-bold">
            PPE check signed ✓
          </h2>
          <p>
            {done.machine} · {done.task}: signed by {done.by} at {done.at}. Work safely.
          </p>
          <p className="mt-2 font-semibold">Confirmed on:</p>
          <ul className="list-disc pl-5">
            {done.items.map((x) => (
              <li key={x}>{x}</li>
            ))}
          </ul>
        </Notice>
        <Button variant="secondary" className="min-h-11" onClick={() => (setDone(null), setOn([]))}>
          Start a new check
        </Button>
      </section>
    );

  return (
    <div className="space-y-4">
      {initialMachineId && machineId === initialMachineId && !machine ? (
        <Notice tone="caution" title="No PPE requirements for this machine">
          The safety officer has not set what to wear at this machine. Ask before you start, or choose the machine below.
        </Notice>
      ) : null}
      {error ? (
        <Notice tone="danger" role="alert">
          {error}
        </Notice>
      ) : null}
      <section aria-labelledby="ppe-machine" className="space-y-2">
        <h2 id="ppe-machine" className="text-xl font-bold">
          1. Your machine
        </h2>
        <div className="grid gap-2 sm:grid-cols-2 lg:grid-cols-3">
          {machines.map((m) => (
            <button
              key={m.id}
              type="button"
              aria-pressed={m.id === machineId}
              onClick={() => chooseMachine(m.id)}
              className={`${big} ${m.id === machineId ? 'border-steel-900 bg-steel-900 text-white' : 'border-steel-300 bg-white text-steel-900'}`}
            >
              <span>
                {m.code} <span className="font-normal">· {m.name}</span>
              </span>
            </button>
          ))}
        </div>
      </section>

      {machine && machine.reqs.length > 1 ? (
        <section aria-labelledby="ppe-task" className="space-y-2">
          <h2 id="ppe-task" className="text-xl font-bold">
            2. Your task
          </h2>
          <div className="grid gap-2 sm:grid-cols-2">
            {machine.reqs.map((r) => (
              <button
                key={r.id}
                type="button"
                aria-pressed={r.id === req?.id}
                onClick={() => (setReqId(r.id), setOn([]), setDone(null))}
                className={`${big} ${r.id === req?.id ? 'border-steel-900 bg-steel-900 text-white' : 'border-steel-300 bg-white text-steel-900'}`}
              >
                {r.task}
              </button>
            ))}
          </div>
        </section>
      ) : null}

      {req ? (
        <section aria-labelledby="ppe-items" className="space-y-3">
          <h2 id="ppe-items" className="text-xl font-bold">
            {machine!.reqs.length > 1 ? '3' : '2'}. Tap each item once you have it on — {req.task}
          </h2>
          <WorkCaution />
          <ul className="grid gap-2 md:grid-cols-2">
            {req.required.map((i) => {
              const isOn = on.includes(i.code);
              return (
                <li key={i.code}>
                  <button
                    type="button"
                    aria-pressed={isOn}
                    onClick={() => setOn((s) => (isOn ? s.filter((x) => x !== i.code) : [...s, i.code]))}
                    className={`${big} ${isOn ? 'border-safe bg-safe-soft text-safe-ink' : 'border-mandatory bg-mandatory-soft text-mandatory-ink'}`}
                  >
                    <span>
                      {i.label}
                      {i.detail ? <span className="block text-sm font-normal">{i.detail}</span> : null}
                      <span className="block text-xs font-normal">Source: {i.source}</span>
                    </span>
                    <span className={`shrink-0 rounded px-2 py-1 text-sm font-bold ${isOn ? 'bg-safe text-white' : 'bg-mandatory text-white'}`}>
                      {isOn ? 'On ✓' : 'Not yet on'}
                    </span>
                  </button>
                </li>
              );
            })}
          </ul>
          {req.hearing ? (
            <section aria-label="Noise at this task" className="space-y-1 text-steel-800">
              <h3 className="text-sm font-semibold">Noise at this task (OSHA 29 CFR 1910.95 App. A)</h3>
              <NoiseVerdicts hearing={req.hearing} />
              <p className="text-sm text-steel-700">
                Hearing protection required from {req.hearing.requiredFromDbA} dBA — {req.hearing.ruleSource}.
              </p>
            </section>
          ) : null}
          {req.lastCheckAt ? (
            <p className="text-sm text-steel-700">
              Last check on this task: {req.lastCheckByName}, {f.dateTime(req.lastCheckAt)}.
            </p>
          ) : null}
          <div ref={signStep} className="space-y-3">
            {missing.length ? (
              <Notice tone="danger" title="Do not start yet">
                Still to put on: {missing.map((m) => m.label.toLowerCase()).join(', ')}. If an item is missing or damaged, get a replacement or tell your
                supervisor.
              </Notice>
            ) : (
              <Notice tone="safe" title="Everything on">
                Sign the check to start your shift.
              </Notice>
            )}
            <Button
              className="min-h-16 w-full text-lg"
              disabled={missing.length > 0}
              onClick={() =>
                sign(
                  'ppe-check-done',
                  async (password) => {
                    setError(null);
                    await record.mutateAsync({
                      requirementId: req.id,
                      confirmed: on,
                      password,
                    });
                    const at = f.time(new Date().toISOString());
                    setOn([]);
                    if (onSigned) return onSigned({ machineCode: machine!.code, task: req.task, by: me.name, at });
                    setDone({
                      machine: machine!.code,
                      task: req.task,
                      by: me.name,
                      at,
                      items: req.required.filter((i) => on.includes(i.code)).map((i) => i.label),
                    });
                  },
                  {
                    onError: (err) => setError(err instanceof ApiError ? err.message : 'Could not reach the server; the check was not recorded.'),
                  },
                )
              }
            >
              Sign: PPE check done
            </Button>
          </div>
        </section>
      ) : null}
      {dialog}
    </div>
  );
}
