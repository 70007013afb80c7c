import { useMemo, useState } from 'react';
import { Link } from 'react-router-dom';
import { Badge, Notice } from '../../../components/ui/notice';
import { Button } from '../../../components/ui/button';
import { MACHINE_KIND_LABELS, type MachineKind } from '../../../../shared/schemas/machines';
import type { ApplyStartersResult, PlanLookups, StarterView } from '../../../../shared/schemas/plans';
import { useStarters } from '../api/get-starters';
import { useApplyStarters } from '../api/apply-starters';
import { inputClass } from './format';

const FIT_BADGE = {
  fits: <Badge tone="safe">Fits</Badge>,
  partial: <Badge tone="caution">Fits in part</Badge>,
  no: <Badge>Cannot apply</Badge>,
} as const;

/**
 * Pick a machine; the server says for each starter plan whether it fits that machine (kind, meters,
 * already applied) and why not, so the admin sees it before ticking anything.
 */
export function StartersPanel({ lookups }: { lookups: PlanLookups }) {
  const apply = useApplyStarters();
  const [machineId, setMachineId] = useState('');
  const starters = useStarters(machineId || undefined);
  const [chosen, setChosen] = useState<Set<string>>(new Set());
  const [result, setResult] = useState<ApplyStartersResult | null>(null);
  const [error, setError] = useState<string | null>(null);
  const machine = lookups.machines.find((m) => m.id === machineId);
  const kind = machine ? (MACHINE_KIND_LABELS[machine.kind as MachineKind] ?? machine.kind) : '';
  const { forKind, otherKinds } = useMemo(() => {
    const all = machine ? (starters.data?.starters ?? []) : [];
    const mine = (s: StarterView) => s.machineKinds.includes(machine?.kind ?? '');
    return { forKind: all.filter(mine), otherKinds: all.filter((s) => !mine(s)) };
  }, [starters.data, machine]);
  const applicable = forKind.filter((s) => s.fit?.status !== 'no');
  const toggle = (k: string) =>
    setChosen((c) => {
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
      <p className="text-steel-700">
        Starting points written from common shop practice. Adjust intervals to your machines, the maker’s manual and local rules after applying them.
      </p>
      <div className="max-w-md">
        <label htmlFor="starter-machine" className="block text-sm font-semibold">
          Machine
        </label>
        <select
          id="starter-machine"
          className={inputClass}
          value={machineId}
          onChange={(e) => {
            setMachineId(e.target.value);
            setChosen(new Set());
            setResult(null);
            setError(null);
          }}
        >
          <option value="">Choose a machine…</option>
          {lookups.machines.map((m) => (
            <option key={m.id} value={m.id}>
              {m.parentId ? '— ' : ''}
              {m.code} · {m.name} ({MACHINE_KIND_LABELS[m.kind as MachineKind] ?? m.kind})
            </option>
          ))}
        </select>
      </div>
      {machine && starters.isLoading ? (
        <p role="status" className="text-steel-600">
          Checking which starter plans fit {machine.code}…
        </p>
      ) : null}
      {machine && starters.isError ? (
        <Notice tone="danger" role="alert">
          Could not check the starter plans for {machine.code}: {starters.error.message}
        </Notice>
      ) : null}
      {machine && starters.data && forKind.length === 0 ? (
        <Notice>
          No starter plans are written for a {kind.toLowerCase()}. Write a plan of your own for {machine.code}.
        </Notice>
      ) : null}
      {machine && forKind.length ? (
        <fieldset>
          <legend className="font-semibold">Starter plans for {machine.code}</legend>
          <p className="text-sm text-steel-600">
            {applicable.length} of {forKind.length} can be applied to {machine.code}. Meters are looked for on {machine.code}, its parent and its components.
          </p>
          <ul className="mt-2 grid gap-2 md:grid-cols-2">
            {forKind.map((s) => (
              <StarterCard key={s.key} starter={s} checked={chosen.has(s.key)} onToggle={() => toggle(s.key)} />
            ))}
          </ul>
        </fieldset>
      ) : null}
      {machine && otherKinds.length ? (
        <details className="text-sm text-steel-700">
          <summary className="cursor-pointer">
            {otherKinds.length} other starter plan{otherKinds.length === 1 ? ' is' : 's are'} meant for other kinds of machine
          </summary>
          <ul className="mt-1 list-disc pl-5">
            {otherKinds.map((s) => (
              <li key={s.key}>
                {s.title}: {s.fit?.reason}
              </li>
            ))}
          </ul>
        </details>
      ) : null}
      {machine && applicable.length ? (
        <div className="flex flex-wrap gap-2">
          <Button onClick={run} disabled={chosen.size === 0} busy={apply.isPending}>
            {chosen.size ? `Apply ${chosen.size} starter plan${chosen.size === 1 ? '' : 's'} to ${machine.code}` : 'Tick the starter plans to apply'}
          </Button>
          {chosen.size < applicable.length ? (
            <Button variant="secondary" onClick={() => setChosen(new Set(applicable.map((s) => s.key)))}>
              Tick all {applicable.length} that can be applied
            </Button>
          ) : null}
        </div>
      ) : null}
      {error ? (
        <Notice tone="danger" role="alert">
          {error}
        </Notice>
      ) : null}
      {result && result.created.length ? (
        <Notice tone="safe" title={`${result.created.length} plan${result.created.length === 1 ? '' : 's'} created`} role="status">
          <ul className="list-disc pl-5">
            {result.created.map((c) => (
              <li key={c.planId}>
                <Link className="underline" to={`/plans/${c.planId}`}>
                  {c.title}
                </Link>
              </li>
            ))}
          </ul>
        </Notice>
      ) : null}
      {result && result.skipped.length ? (
        <Notice tone="caution" title={result.created.length ? 'Check these' : 'No plans created: check these'} role="status">
          <ul className="list-disc pl-5">
            {result.skipped.map((s) => (
              <li key={`${s.key}-${s.reason}`}>
                {s.title}: {s.reason}
              </li>
            ))}
          </ul>
        </Notice>
      ) : null}
    </div>
  );
}

function StarterCard({ starter: s, checked, onToggle }: { starter: StarterView; checked: boolean; onToggle: () => void }) {
  const status = s.fit?.status ?? 'fits';
  const off = status === 'no';
  const reasonId = `starter-${s.key}-fit`;
  return (
    <li>
      <label
        className={`flex min-h-touch gap-3 rounded border p-3 ${off ? 'cursor-not-allowed border-steel-200 bg-steel-50 text-steel-600' : 'cursor-pointer border-steel-300 bg-white'}`}
      >
        <input
          type="checkbox"
          className="mt-1 h-6 w-6 shrink-0"
          checked={checked && !off}
          disabled={off}
          onChange={onToggle}
          aria-describedby={s.fit?.reason ? reasonId : undefined}
        />
        <span>
          <span className="block font-semibold">{s.title}</span>
          <span className="block text-sm text-steel-700">{s.summary}</span>
          <span className="mt-1 flex flex-wrap items-center gap-1">
            {FIT_BADGE[status]}
            {s.requiresLockout ? <Badge tone="mandatory">Lockout</Badge> : null}
            {s.safetyCritical ? <Badge tone="mandatory">Safety work</Badge> : null}
          </span>
          {s.fit?.reason ? (
            <span id={reasonId} className={`mt-1 block text-sm ${status === 'partial' ? 'text-caution-ink' : ''}`}>
              {s.fit.reason}
            </span>
          ) : null}
        </span>
      </label>
    </li>
  );
}
