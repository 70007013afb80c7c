import type { ReactNode } from 'react';

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
