import { forwardRef, useId, type InputHTMLAttributes, type SelectHTMLAttributes, type ReactNode } from 'react';

type Common = { label: string; error?: string; hint?: ReactNode };

const inputClass = (error?: string) =>
  `block w-full min-h-touch rounded border bg-white px-3 py-2 text-base text-steel-900 placeholder:text-steel-400 ${error ? 'border-danger ring-1 ring-danger' : 'border-steel-400'}`;

function Frame({ id, label, error, hint, children }: Common & { id: string; children: ReactNode }) {
  return (
    <div className="space-y-1">
      <label htmlFor={id} className="block text-sm font-semibold text-steel-800">
        {label}
      </label>
      {children}
      {hint && !error ? (
        <p className="text-sm text-steel-600" id={`${id}-hint`}>
          {hint}
        </p>
      ) : null}
      {error ? (
        <p className="text-sm font-semibold text-danger" id={`${id}-error`} role="alert">
          {error}
        </p>
      ) : null}
    </div>
  );
}

export const TextField = forwardRef<HTMLInputElement, Common & InputHTMLAttributes<HTMLInputElement>>(function TextField(
  { label, error, hint, id, ...rest },
  ref,
) {
  const auto = useId();
  const fid = id ?? auto;
  return (
    <Frame id={fid} label={label} error={error} hint={hint}>
      <input
        ref={ref}
        id={fid}
        aria-invalid={error ? true : undefined}
        aria-describedby={error ? `${fid}-error` : hint ? `${fid}-hint` : undefined}
        className={inputClass(error)}
        {...rest}
      />
    </Frame>
  );
});

export const SelectField = forwardRef<HTMLSelectElement, Common & SelectHTMLAttributes<HTMLSelectElement> & { options: { value: string; label: string }[] }>(
  function SelectField({ label, error, hint, id, options, ...rest }, ref) {
    const auto = useId();
    const fid = id ?? auto;
    return (
      <Frame id={fid} label={label} error={error} hint={hint}>
        <select ref={ref} id={fid} aria-invalid={error ? true : undefined} className={inputClass(error)} {...rest}>
          {options.map((o) => (
            <option key={o.value} value={o.value}>
              {o.label}
            </option>
          ))}
        </select>
      </Frame>
    );
  },
);
