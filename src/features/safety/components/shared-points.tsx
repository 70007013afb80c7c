import { Button } from '../../../components/ui/button';
import { Notice } from '../../../components/ui/notice';
import { Link } from 'react-router-dom';
import { missingPointText, type EnergySource, type FeedingPoint } from '../../../../shared/schemas/safety-procedures';

export type PlantMachine = { id: string; code: string; name: string };

/** Toggle buttons for the other machines an isolation point also supplies (a hydraulic unit feeding two cells). */
export function FeedsPicker({
  sourceLabel,
  machines,
  ownMachineId,
  value,
  onChange,
  error,
}: {
  sourceLabel: string;
  machines: PlantMachine[];
  ownMachineId: string;
  value: string[];
  onChange: (ids: string[]) => void;
  error?: string;
}) {
  const others = machines.filter((m) => m.id !== ownMachineId);
  if (others.length === 0) return null;
  // Most points feed only their own machine: the picker stays folded until it is used.
  return (
    <details className="md:col-span-4" open={value.length > 0}>
      <summary className="flex min-h-touch cursor-pointer items-center text-sm font-semibold">
        {value.length
          ? `Also feeds ${others
              .filter((m) => value.includes(m.id))
              .map((m) => m.code)
              .join(', ')}`
          : 'Does this point also feed other machines?'}
      </summary>
      <p className="text-sm text-steel-600">Choose the other machines this point supplies: locking it locks them out too.</p>
      <div className="mt-1 flex flex-wrap gap-2" role="group" aria-label={`Machines ${sourceLabel} also feeds`}>
        {others.map((m) => {
          const on = value.includes(m.id);
          return (
            <button
              key={m.id}
              type="button"
              aria-pressed={on}
              onClick={() => onChange(on ? value.filter((x) => x !== m.id) : [...value, m.id])}
              className={`min-h-touch min-w-touch rounded border px-3 text-sm font-semibold ${on ? 'border-steel-900 bg-steel-900 text-white' : 'border-steel-400 bg-white text-steel-900'}`}
            >
              {m.code} <span className="font-normal">{m.name}</span>
            </button>
          );
        })}
      </div>
      {error ? (
        <p role="alert" className="text-sm font-semibold text-danger">
          {error}
        </p>
      ) : null}
    </details>
  );
}

/** A shared point copied into a fed machine's procedure under the same tag (without the machines it feeds). */
export const copyOfPoint = ({ fromMachine: _from, ...point }: FeedingPoint): EnergySource => point;

/**
 * Points on other machines that feed this one and are not yet in the form: the procedure must
 * name each before it can be approved (OSHA 29 CFR 1910.147(d)(3)), so the editor offers them.
 */
export function SharedPointOffer({ points, presentKeys, onAdd }: { points: FeedingPoint[]; presentKeys: string[]; onAdd: (p: FeedingPoint) => void }) {
  const missing = points.filter((p) => !presentKeys.includes(p.key));
  if (points.length === 0) return null;
  if (missing.length === 0)
    return (
      <Notice tone="safe" title="Shared points named">
        This machine is also fed from {points.map((p) => `${p.key} on ${p.fromMachine.code}`).join(', ')}; the procedure names{' '}
        {points.length === 1 ? 'it' : 'each'}.
      </Notice>
    );
  return (
    <Notice tone="caution" title="Fed from a shared isolation point">
      <ul className="space-y-2">
        {missing.map((p) => (
          <li key={`${p.fromMachine.id}-${p.key}`} className="flex flex-wrap items-center gap-3">
            <span>
              <strong>{p.key}</strong> on {p.fromMachine.code} {p.fromMachine.name.toLowerCase()} ({p.description}, {p.isolationDevice}) feeds this machine. Add
              it before the procedure can be approved.
            </span>
            <Button variant="secondary" onClick={() => onAdd(p)}>
              Add the shared point {p.key}
            </Button>
          </li>
        ))}
      </ul>
    </Notice>
  );
}

/** "also feeds C1, C2" under a source on the procedure view and the placard. */
export function FeedsLine({ feeds, machines }: { feeds?: string[]; machines: Record<string, { code: string; name: string }> }) {
  if (!feeds?.length) return null;
  return (
    <p className="mt-2 rounded bg-caution-soft px-2 py-1 text-sm font-semibold">
      Also feeds {feeds.map((id) => machines[id]?.code ?? 'a removed machine').join(', ')}: locking it locks them out too.
    </p>
  );
}

/** On the draft, above the approve action: shared points that feed this machine and the draft leaves out. */
export function MissingSharedPoints({
  points,
  sources,
  machineCode,
  editHref,
}: {
  points: FeedingPoint[];
  sources: EnergySource[];
  machineCode: string;
  editHref?: string;
}) {
  const missing = points.filter((p) => !sources.some((s) => s.key === p.key));
  if (missing.length === 0) return null;
  return (
    <Notice tone="danger" title="Approval will be refused">
      <ul className="list-disc pl-5">
        {missing.map((p) => (
          <li key={`${p.fromMachine.id}-${p.key}`}>{missingPointText(p, machineCode)}.</li>
        ))}
      </ul>
      {editHref ? (
        <Link to={editHref} className="mt-2 inline-flex min-h-touch items-center font-semibold underline">
          Edit the draft to add {missing.length === 1 ? 'it' : 'them'}
        </Link>
      ) : null}
    </Notice>
  );
}
