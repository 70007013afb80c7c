import { useEffect, useId, useRef, useState, type FormEvent, type ReactNode } from 'react';
import { Button } from '../../../components/ui/button';
import { useModal } from '../../../components/ui/modal';
import { focusSoon } from '../../../components/ui/live-region';
import { ApiError } from '../../../lib/api-client';
import { MEANING_LABELS, MEANING_STATEMENTS, type SignMeaning } from '../../../../shared/schemas/safety-sign-offs';
import { ROLE_LABELS, type Role } from '../../../../shared/permissions';

/**
 * The signing step of every safety record: what the signature means, who signs, and the
 * password typed again. A wrong password stays in the dialog; other errors go back to the form.
 */
export function SignDialog({
  open,
  meaning,
  signer,
  children,
  onSign,
  onCancel,
  onError,
}: {
  open: boolean;
  meaning: SignMeaning;
  signer: { name: string; role: Role };
  children?: ReactNode;
  onSign: (password: string) => Promise<void>;
  onCancel: () => void;
  onError: (err: unknown) => void;
}) {
  const ref = useRef<HTMLDialogElement>(null);
  const [password, setPassword] = useState('');
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const id = useId();
  useModal(ref, open);
  useEffect(() => {
    if (!open) return;
    setPassword('');
    setError(null);
  }, [open]);

  const submit = async (e: FormEvent) => {
    e.preventDefault();
    // The dialog may sit inside a page's form in the React tree; its submit must not reach that form.
    e.stopPropagation();
    if (!password) {
      setError('Enter your password to sign');
      return;
    }
    setBusy(true);
    setError(null);
    try {
      await onSign(password);
      setPassword('');
    } catch (err) {
      if (err instanceof ApiError && err.code === 'signature_refused') setError(err.fields.find((f) => f.path === 'password')?.message ?? err.message);
      else onError(err);
    } finally {
      setBusy(false);
    }
  };

  return (
    <dialog
      ref={ref}
      onCancel={(e) => {
        e.preventDefault();
        onCancel();
      }}
      aria-labelledby={`${id}-title`}
      className="m-auto w-[min(34rem,94vw)] rounded border border-steel-300 p-0 shadow-xl backdrop:bg-steel-950/60"
    >
      <form onSubmit={submit} className="space-y-4 p-5" noValidate>
        <div className="border-l-8 border-mandatory pl-3">
          <p className="text-xs font-bold uppercase tracking-wider text-mandatory-ink">Signature</p>
          <h2 id={`${id}-title`} className="text-xl font-bold">
            Sign: {MEANING_LABELS[meaning]}
          </h2>
        </div>
        <blockquote className="rounded bg-steel-100 p-3 text-base font-semibold text-steel-900">“{MEANING_STATEMENTS[meaning]}”</blockquote>
        {children ? <div className="text-sm text-steel-800">{children}</div> : null}
        <p className="text-sm text-steel-700">
          Signing as <strong>{signer.name}</strong> ({ROLE_LABELS[signer.role]}). The server records the time. A signature cannot be changed afterwards; a
          mistake is fixed with a correction.
        </p>
        <div className="space-y-1">
          <label htmlFor={`${id}-pw`} className="block text-sm font-semibold text-steel-800">
            Your password
          </label>
          <input
            id={`${id}-pw`}
            type="password"
            autoComplete="current-password"
            value={password}
            onChange={(e) => setPassword(e.target.value)}
            aria-invalid={error ? true : undefined}
            aria-describedby={error ? `${id}-err` : undefined}
            className={`block min-h-touch w-full rounded border bg-white px-3 py-2 text-base ${error ? 'border-danger ring-1 ring-danger' : 'border-steel-400'}`}
          />
          {error ? (
            <p id={`${id}-err`} role="alert" className="text-sm font-semibold text-danger">
              {error}
            </p>
          ) : null}
        </div>
        <div className="flex flex-wrap justify-end gap-2">
          <Button variant="secondary" onClick={onCancel}>
            Cancel
          </Button>
          <Button type="submit" busy={busy}>
            Sign with my password
          </Button>
        </div>
      </form>
    </dialog>
  );
}

type Pending = {
  meaning: SignMeaning;
  run: (password: string) => Promise<void>;
  onError?: (err: unknown) => void;
  detail?: ReactNode;
  /** Where focus goes once signed: the result, or the next thing to do (the signing control often goes away). */
  focusAfter?: () => HTMLElement | null | undefined;
};

/** One signing dialog per screen: `sign(meaning, run)` opens it; `run` gets the password. */
export function useSignFlow(signer: { name: string; role: Role } | undefined) {
  const [pending, setPending] = useState<Pending | null>(null);
  const dialog = signer ? (
    <SignDialog
      open={pending !== null}
      meaning={pending?.meaning ?? 'correction'}
      signer={signer}
      onSign={async (pw) => {
        await pending!.run(pw);
        const focusAfter = pending!.focusAfter;
        setPending(null);
        if (focusAfter) focusSoon(focusAfter);
      }}
      onCancel={() => setPending(null)}
      onError={(err) => {
        const p = pending;
        setPending(null);
        p?.onError?.(err);
      }}
    >
      {pending?.detail}
    </SignDialog>
  ) : null;
  return { sign: (meaning: SignMeaning, run: Pending['run'], opts: Omit<Pending, 'meaning' | 'run'> = {}) => setPending({ meaning, run, ...opts }), dialog };
}
