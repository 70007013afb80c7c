import type { ComponentPropsWithRef } from 'react';

type Variant = 'primary' | 'secondary' | 'danger' | 'ghost';
const styles: Record<Variant, string> = {
  primary: 'bg-steel-800 text-white hover:bg-steel-700 disabled:bg-steel-400 aria-disabled:bg-steel-600',
  secondary: 'bg-white text-steel-900 border border-steel-400 hover:bg-steel-50 disabled:text-steel-400',
  danger: 'bg-danger text-white hover:bg-danger-ink disabled:opacity-60',
  ghost: 'bg-transparent text-steel-800 hover:bg-steel-200',
};

/**
 * While `busy`, the button ignores presses but stays enabled and focusable: a disabled button
 * drops keyboard focus to the page body, and the person would have to find their place again.
 */
export function Button({
  variant = 'primary',
  className = '',
  type = 'button',
  busy,
  children,
  onClick,
  ...rest
}: ComponentPropsWithRef<'button'> & { variant?: Variant; busy?: boolean }) {
  return (
    <button
      type={type}
      className={`inline-flex min-h-touch min-w-touch items-center justify-center gap-2 rounded px-4 py-2 text-base font-semibold tracking-wide disabled:cursor-not-allowed ${busy ? 'cursor-progress' : ''} ${styles[variant]} ${className}`}
      aria-busy={busy || undefined}
      aria-disabled={busy || undefined}
      {...rest}
      onClick={(e) => {
        // A press while busy would send the same thing twice; for a submit button this also stops the form.
        if (busy) return e.preventDefault();
        onClick?.(e);
      }}
    >
      {busy ? <span className="h-4 w-4 animate-spin rounded-full border-2 border-current border-t-transparent" aria-hidden /> : null}
      {children}
    </button>
  );
}
