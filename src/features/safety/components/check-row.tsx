import type { ReactNode } from 'react';
import type { ProcedureContent } from '../../../../shared/schemas/safety-procedures';
import type { LockPointRow } from '../../../../shared/schemas/safety-lockout';

/** A large tick box with its label, for the confirmations a signer ticks one by one. */
export function Check({ label, checked, onChange, hint }: { label: ReactNode; checked: boolean; onChange: (v: boolean) => void; hint?: string }) {
  return (
    <label
      className={`flex min-h-touch cursor-pointer items-start gap-3 rounded border px-3 py-2 ${checked ? 'border-safe bg-safe-soft' : 'border-steel-300 bg-white'}`}
    >
      <input type="checkbox" className="mt-1 h-6 w-6 shrink-0" checked={checked} onChange={(e) => onChange(e.target.checked)} />
      <span>
        <span className="font-semibold">{label}</span>
        {hint ? <span className="block text-sm text-steel-700">{hint}</span> : null}
      </span>
    </label>
  );
}

/**
 * The verification ticks of 1910.147(d)(6): the procedure's verify steps, the start attempt, then
 * zero energy at each isolation point with the procedure's way of checking it.
 */
export function VerifyChecklist({
  content,
  points,
  startTried,
  onStartTried,
  tested,
  onTested,
}: {
  content: ProcedureContent | undefined;
  points: LockPointRow[];
  startTried: boolean;
  onStartTried: (v: boolean) => void;
  tested: string[];
  onTested: (ids: string[]) => void;
}) {
  return (
    <>
      {content?.steps.verify.length ? (
        <ul className="list-disc pl-6 text-steel-800">
          {content.steps.verify.map((s, i) => (
            <li key={i}>{s}</li>
          ))}
        </ul>
      ) : null}
      <Check label="I tried to start the machine with its normal controls; it did not start" checked={startTried} onChange={onStartTried} />
      {points.map((p) => (
        <Check
          key={p.id}
          label={`${p.sourceKey} · ${p.sourceKind}: zero energy`}
          hint={content?.sources.find((s) => s.key === p.sourceKey)?.verifyMethod}
          checked={tested.includes(p.id)}
          onChange={(v) => onTested(v ? [...tested, p.id] : tested.filter((x) => x !== p.id))}
        />
      ))}
    </>
  );
}
