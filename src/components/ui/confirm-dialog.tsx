import { useId, useRef, type ReactNode } from 'react';
import { Button } from './button';
import { useModal } from './modal';

/** A native modal dialog: focus is trapped, Escape cancels, and focus goes back to the opener on close. */
export function ConfirmDialog({
  open,
  title,
  children,
  confirmLabel,
  cancelLabel = 'Cancel',
  tone = 'primary',
  busy,
  onConfirm,
  onCancel,
}: {
  open: boolean;
  title: string;
  children: ReactNode;
  confirmLabel: string;
  cancelLabel?: string;
  tone?: 'primary' | 'danger';
  busy?: boolean;
  onConfirm: () => void;
  onCancel: () => void;
}) {
  const ref = useRef<HTMLDialogElement>(null);
  const titleId = useId();
  useModal(ref, open);
  return (
    <dialog
      ref={ref}
      onCancel={(e) => {
        e.preventDefault();
        onCancel();
      }}
      className="m-auto w-[min(32rem,92vw)] rounded border border-steel-300 p-0 shadow-xl backdrop:bg-steel-950/50"
      aria-labelledby={titleId}
    >
      <div className="space-y-3 p-5">
        <h2 id={titleId} className="text-xl font-bold">
          {title}
        </h2>
        <div className="text-steel-700">{children}</div>
        <div className="flex justify-end gap-2 pt-2">
          <Button variant="secondary" onClick={onCancel}>
            {cancelLabel}
          </Button>
          <Button variant={tone === 'danger' ? 'danger' : 'primary'} busy={busy} onClick={onConfirm}>
            {confirmLabel}
          </Button>
        </div>
      </div>
    </dialog>
  );
}
