import type { ButtonHTMLAttributes } from 'react';

type Variant = 'primary' | 'secondary' | 'danger' | 'ghost';
const styles: Record<Variant, string> = {
  primary: 'bg-steel-800 text-white hover:bg-steel-700 disabled:bg-steel-400',
  secondary: 'bg-white text-steel-900 border border-steel-400 hover:bg-steel-50 disabled:text-steel-400',
  danger: 'bg-danger text-white hover:bg-danger-ink disabled:opacity-60',
  ghost: 'bg-transparent text-steel-800 hover:bg-steel-200',
};

export function Button({
  variant = 'primary',
  className = '',
  type = 'button',
  busy,
  children,
  ...rest
}: ButtonHTMLAttributes<HTMLButtonElement> & { variant?: Variant; busy?: boolean }) {
  return (
    <button
      type={type}
      className={`inline-flex min-h-touch min-w-touch items-center justify-center gap-2 rounded px-4 py-2 text-base font-semibold tracking-wide disabled:cursor-not-allowed ${styles[variant]} ${className}`}
      disabled={busy || rest.disabled}
      aria-busy={busy || undefined}
      {...rest}
    >
      {busy ? <span className="h-4 w-4 animate-spin rounded-full border-2 border-current border-t-transparent" aria-hidden /> : null}
      {children}
    </button>
  );
}
