import { useEffect, useState } from 'react';
import { Button } from '../../../components/ui/button';
import { SelectField, TextField } from '../../../components/ui/field';
import { EmptyState, Notice, Panel } from '../../../components/ui/notice';
import { WorkCaution } from '../../../components/ui/caution';
import { ApiError } from '../../../lib/api-client';
import { can, type Role } from '../../../../shared/permissions';
import { FIRE_WATCH_RULES } from '../../../../shared/domain/hot-work';
import type { FireWatchRow } from '../../../../shared/schemas/safety-records';
import { useFireWatches } from '../api/get-fire-watches';
import { useStartFireWatch } from '../api/start-fire-watch';
import { useEndFireWatch } from '../api/end-fire-watch';
import { useSafetyMachines } from '../api/get-safety-machines';
import { useSafetySettings } from '../api/get-safety-settings';
import { useSignFlow } from './sign-dialog';
import { useShopFormat } from '../../../lib/format';

function useNow(ms = 1000) {
  const [now, setNow] = useState(() => Date.now());
  useEffect(() => {
    const t = setInterval(() => setNow(Date.now()), ms);
    return () => clearInterval(t);
  }, [ms]);
  return now;
}

function Countdown({ w, me, onEnd }: { w: FireWatchRow; me: { id: string }; onEnd: () => void }) {
  const f = useShopFormat();
  const now = useNow();
  const left = new Date(w.until).getTime() - now;
  const mins = Math.floor(Math.max(left, 0) / 60_000);
  const secs = Math.floor((Math.max(left, 0) % 60_000) / 1000);
  return (
    <article
      className={`rounded border-l-8 p-4 ${left > 0 ? 'border-caution bg-caution-soft' : 'border-safe bg-safe-soft'}`}
      aria-label={`Fire watch at ${w.machineCode}`}
    >
      <p className="text-lg font-bold">
        {w.machineCode} · {w.machineName} — {w.watcherName}
      </p>
      <p className="text-4xl font-bold tabular-nums" role="timer" aria-live="off">
        {left > 0 ? `${String(mins).padStart(2, '0')}:${String(secs).padStart(2, '0')}` : 'Time is up'}
      </p>
      <p>
        {left > 0 ? `Keep watching until ${f.time(w.until)}.` : 'The minimum watch is over: check the area once more, then sign.'} Cutting ended{' '}
        {f.time(w.cuttingEndedAt)}. Rule: {w.ruleLabel} ({w.ruleSource}).
      </p>
      {w.area ? <p className="text-sm">Area: {w.area}</p> : null}
      {w.followUp ? <p className="text-sm text-steel-700">Afterwards: {w.followUp}</p> : null}
      {w.watcherId === me.id ? (
        <Button className="mt-2" disabled={left > 0} onClick={onEnd}>
          Sign: watch ended, no fire found
        </Button>
      ) : null}
    </article>
  );
}

/** Fire watch after plasma cutting: the end time follows the rule the site chose in settings. */
export function HotWork({ me }: { me: { id: string; name: string; role: Role } }) {
  const f = useShopFormat();
  const watches = useFireWatches();
  const machines = useSafetyMachines();
  const settings = useSafetySettings();
  const start = useStartFireWatch();
  const end = useEndFireWatch();
  const { sign, dialog } = useSignFlow(me);
  const [machineId, setMachineId] = useState('');
  const [area, setArea] = useState('');
  const [message, setMessage] = useState<{ tone: 'safe' | 'danger'; text: string } | null>(null);
  const rule = settings.data ? FIRE_WATCH_RULES[settings.data.fireWatchRule] : null;
  const running = (watches.data ?? []).filter((w) => !w.endedAt);
  const ended = (watches.data ?? []).filter((w) => w.endedAt).slice(0, 10);
  const fail = (err: unknown) => setMessage({ tone: 'danger', text: err instanceof ApiError ? err.message : 'Could not reach the server' });

  return (
    <div className="space-y-4">
      {message ? (
        <Notice tone={message.tone} role={message.tone === 'danger' ? 'alert' : 'status'}>
          {message.text}
        </Notice>
      ) : null}
      {rule ? (
        <Notice tone="info" title={`Site rule: ${rule.label}`}>
          {rule.description} Source: {rule.source}.{' '}
          {settings.data?.fireWatchRequired
            ? 'This site requires a fire watch after every plasma cut near combustibles.'
            : 'This site does not require a fire watch by default; keep one where the area needs it.'}
        </Notice>
      ) : null}
      <WorkCaution />
      {can(me.role, 'safety.hotwork.sign') ? (
        <Panel title="Start a fire watch now (cutting has just stopped)">
          <div className="grid gap-3 md:grid-cols-[1fr_1fr_auto] md:items-end">
            <SelectField
              label="Machine"
              value={machineId}
              onChange={(e) => setMachineId(e.target.value)}
              options={[{ value: '', label: 'Choose a machine' }, ...(machines.data ?? []).map((m) => ({ value: m.id, label: `${m.code} · ${m.name}` }))]}
            />
            <TextField label="Area watched (optional)" value={area} onChange={(e) => setArea(e.target.value)} />
            <Button
              disabled={!machineId}
              onClick={() =>
                sign(
                  'fire-watch-started',
                  async (password) => {
                    const w = await start.mutateAsync({ machineId, area: area || undefined, password });
                    setMessage({ tone: 'safe', text: `Fire watch started: stay until ${f.time(w.until)}.` });
                  },
                  { onError: fail },
                )
              }
            >
              Sign: start fire watch
            </Button>
          </div>
        </Panel>
      ) : null}
      <Panel title={`Running (${running.length})`}>
        {running.length ? (
          <div className="grid gap-3 md:grid-cols-2">
            {running.map((w) => (
              <Countdown
                key={w.id}
                w={w}
                me={me}
                onEnd={() =>
                  sign(
                    'fire-watch-ended',
                    async (password) => {
                      await end.mutateAsync({ id: w.id, noFireFound: true, password });
                      setMessage({ tone: 'safe', text: `Fire watch at ${w.machineCode} ended and signed.` });
                    },
                    { onError: fail },
                  )
                }
              />
            ))}
          </div>
        ) : (
          <EmptyState title="No fire watch running" />
        )}
      </Panel>
      <Panel title="Recently ended">
        {ended.length ? (
          <ul className="space-y-1">
            {ended.map((w) => (
              <li key={w.id}>
                {w.machineCode}: {w.watcherName}, cutting ended {f.dateTime(w.cuttingEndedAt)}, watch ended {f.dateTime(w.endedAt)} ({w.ruleLabel})
              </li>
            ))}
          </ul>
        ) : (
          <p className="text-steel-700">None yet.</p>
        )}
      </Panel>
      {dialog}
    </div>
  );
}
