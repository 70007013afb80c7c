import { useMemo, useState } from 'react';
import { Link } from 'react-router-dom';
import { Badge, Notice } from '../../../components/ui/notice';
import { Button } from '../../../components/ui/button';
import { MACHINE_KIND_LABELS, type MachineKind } from '../../../../shared/schemas/machines';
import type { ApplyStartersResult, PlanLookups } from '../../../../shared/schemas/plans';
import { useStarters } from '../api/get-starters';
import { useApplyStarters } from '../api/apply-starters';
import { inputClass } from './format';

/** Pick a machine, tick the starter plans that fit it, apply them in one go. */
export function StartersPanel({ lookups }: { lookups: PlanLookups }) {
  const starters = useStarters();
  const apply = useApplyStarters();
  const [machineId, setMachineId] = useState('');
  const [chosen, setChosen] = useState<Set<string>>(new Set());
  const [result, setResult] = useState<ApplyStartersResult | null>(null);
  const [error, setError] = useState<string | null>(null);
  const machine = lookups.machines.find((m) => m.id === machineId);
  const fitting = useMemo(() => (starters.data?.starters ?? []).filter((s) => machine && s.machineKinds.includes(machine.kind)), [starters.data, machine]);
  const toggle = (k: string) => setChosen((c) => {
    const n = new Set(c);
    if (n.has(k)) n.delete(k);
    else n.add(k);
    return n;
  });
  const run = async () => {
    setError(null);
    setResult(null);
    try {
      setResult(await apply.mutateAsync({ machineId, starterKeys: [...chosen] }));
      setChosen(new Set());
    } catch (err) {
      setError(err instanceof Error ? err.message : 'Could not apply the starter plans');
    }
  };
  return (
    <div className="space-y-3">
      <p className="text-steel-700">Starting points written from common shop practice. Adjust intervals to your machines, the maker’s manual and local rules after applying them.</p>
      <div className="max-w-md">
        <label htmlFor="starter-machine" className="block text-sm font-semibold">Machine</label>
        <select id="starter-machine" className={inputClass} value={machineId} onChange={(e) => { setMachineId(e.target.value); setChosen(new Set()); setResult(null); }}>
          <option value="">Choose a machine…</option>
          {lookups.machines.map((m) => <option key={m.id} value={m.id}>{m.parentId ? '— ' : ''}{m.code} · {m.name} ({MACHINE_KIND_LABELS[m.kind as MachineKind] ?? m.kind})</option>)}
        </select>
      </div>
      {machine && fitting.length === 0 ? <Notice>No starter plans for a {MACHINE_KIND_LABELS[machine.kind as MachineKind] ?? machine.kind}.</Notice> : null}
      {fitting.length ? (
        <fieldset>
          <legend className="font-semibold">Starter plans for {machine?.code}</legend>
          <ul className="mt-2 grid gap-2 md:grid-cols-2">
            {fitting.map((s) => (
              <li key={s.key}>
                <label className="flex min-h-touch cursor-pointer gap-3 rounded border border-steel-300 bg-white p-3">
                  <input type="checkbox" className="mt-1 h-6 w-6 shrink-0" checked={chosen.has(s.key)} onChange={() => toggle(s.key)} />
                  <span>
                    <span className="block font-semibold">{s.title}</span>
                    <span className="block text-sm text-steel-700">{s.summary}</span>
                    <span className="mt-1 flex flex-wrap gap-1">
                      {s.requiresLockout ? <Badge tone="mandatory">Lockout</Badge> : null}
                      {s.safetyCritical ? <Badge tone="mandatory">Safety work</Badge> : null}
                      {s.needsMeters.length ? <span className="text-xs text-steel-600">Needs: {s.needsMeters.join(', ')}</span> : null}
                    </span>
                  </span>
                </label>
              </li>
            ))}
          </ul>
        </fieldset>
      ) : null}
      {machine ? <Button onClick={run} disabled={chosen.size === 0} busy={apply.isPending}>Apply {chosen.size || ''} starter plan{chosen.size === 1 ? '' : 's'}</Button> : null}
      {error ? <Notice tone="danger" role="alert">{error}</Notice> : null}
      {result && result.created.length ? (
        <Notice tone="safe" title={`${result.created.length} plan${result.created.length === 1 ? '' : 's'} created`} role="status">
          <ul className="list-disc pl-5">
            {result.created.map((c) => <li key={c.planId}><Link className="underline" to={`/plans/${c.planId}`}>{c.title}</Link></li>)}
          </ul>
        </Notice>
      ) : null}
      {result && result.skipped.length ? (
        <Notice tone="caution" title={result.created.length ? 'Check these' : 'No plans created: check these'} role="status">
          <ul className="list-disc pl-5">
            {result.skipped.map((s) => <li key={`${s.key}-${s.reason}`}>{s.title}: {s.reason}</li>)}
          </ul>
        </Notice>
      ) : null}
    </div>
  );
}
