import type { ReactNode } from 'react';

type Tone = 'danger' | 'caution' | 'mandatory' | 'safe' | 'info';
const tones: Record<Tone, string> = {
  danger: 'border-danger bg-danger-soft text-danger-ink',
  caution: 'border-caution bg-caution-soft text-caution-ink',
  mandatory: 'border-mandatory bg-mandatory-soft text-mandatory-ink',
  safe: 'border-safe bg-safe-soft text-safe-ink',
  info: 'border-steel-400 bg-white text-steel-800',
};

/** A bordered message; colour follows ISO 3864-1 meanings, the text always says it too. */
export function Notice({ tone = 'info', title, children, role }: { tone?: Tone; title?: string; children: ReactNode; role?: 'alert' | 'status' | 'note' }) {
  return (
    <div className={`rounded border-l-8 px-4 py-3 ${tones[tone]}`} role={role}>
      {title ? <p className="font-bold">{title}</p> : null}
      <div className="text-sm leading-relaxed">{children}</div>
    </div>
  );
}

/** A form's outcome: what the server refused (announced at once) and what was saved. */
export function FormMessages({ error, saved }: { error?: ReactNode; saved?: ReactNode }) {
  return (
    <>
      {error ? (
        <Notice tone="danger" role="alert">
          {error}
        </Notice>
      ) : null}
      {saved ? (
        <Notice tone="safe" role="status">
          {saved}
        </Notice>
      ) : null}
    </>
  );
}

export function EmptyState({ title, children }: { title: string; children?: ReactNode }) {
  return (
    <div className="rounded border border-dashed border-steel-400 bg-white p-8 text-center">
      <p className="text-lg font-semibold text-steel-800">{title}</p>
      {children ? <div className="mt-2 text-steel-600">{children}</div> : null}
    </div>
  );
}

export function Panel({ title, actions, children, className = '' }: { title?: string; actions?: ReactNode; children: ReactNode; className?: string }) {
  return (
    <section className={`rounded border border-steel-200 bg-white shadow-sm ${className}`}>
      {title || actions ? (
        <header className="flex flex-wrap items-center justify-between gap-2 border-b border-steel-200 px-4 py-3">
          {title ? <h2 className="text-lg font-bold text-steel-900">{title}</h2> : <span />}
          {actions}
        </header>
      ) : null}
      <div className="p-4">{children}</div>
    </section>
  );
}

export function Badge({ tone = 'info', children }: { tone?: Tone; children: ReactNode }) {
  const map: Record<Tone, string> = {
    danger: 'bg-danger text-white',
    caution: 'bg-caution text-steel-950',
    mandatory: 'bg-mandatory text-white',
    safe: 'bg-safe text-white',
    info: 'bg-steel-200 text-steel-900',
  };
  return <span className={`inline-block rounded px-2 py-0.5 text-xs font-bold uppercase tracking-wide ${map[tone]}`}>{children}</span>;
}
