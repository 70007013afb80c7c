import type { FocusEvent } from 'react';

/**
 * Selects a pre-filled field's whole value when it takes focus, so one keystroke replaces it.
 * Deferred a tick: a tap or click places the caret after focus, which would undo an immediate select.
 */
export function selectOnFocus(e: FocusEvent<HTMLInputElement>) {
  const el = e.currentTarget;
  setTimeout(() => {
    if (document.activeElement === el) el.select();
  }, 0);
}
