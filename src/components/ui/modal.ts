import { useEffect, useRef, type RefObject } from 'react';
import { focusSoon } from './live-region';

/** The page's main heading: where focus goes when nothing nearer is left. */
export const mainHeading = () => document.querySelector<HTMLElement>('main h1');

/**
 * Opens and closes a native modal dialog with `open`, and gives focus back when it closes or goes
 * away: to the control that opened it if that is still on the page and enabled, else to
 * `fallback()`, else to the page's heading. Focus that the action already moved elsewhere (to
 * its result) is left where it is.
 */
export function useModal(ref: RefObject<HTMLDialogElement | null>, open: boolean, fallback?: () => HTMLElement | null | undefined) {
  const opener = useRef<HTMLElement | null>(null);
  const fallbackRef = useRef(fallback);
  fallbackRef.current = fallback;
  const isOpen = useRef(false);

  const giveFocusBack = (dialog: HTMLDialogElement) => {
    const from = opener.current;
    focusSoon(() => {
      const active = document.activeElement;
      const lost = !active || active === document.body || !active.isConnected || dialog.contains(active);
      if (!lost) return null;
      // A table that re-renders its cells replaces the opener with an identical button: find that one by its name.
      const label = from?.getAttribute('aria-label');
      const same = from && !from.isConnected && label ? document.querySelector<HTMLElement>(`${from.tagName}[aria-label="${CSS.escape(label)}"]`) : from;
      const usable = same && same.isConnected && !(same as HTMLButtonElement).disabled && same.getClientRects().length > 0;
      const target = usable ? same : (fallbackRef.current?.() ?? mainHeading());
      if (target && target.tagName === 'H1' && !target.hasAttribute('tabindex')) target.tabIndex = -1;
      return target;
    });
  };

  useEffect(() => {
    const d = ref.current;
    if (!d) return;
    if (open && !d.open) {
      opener.current = document.activeElement instanceof HTMLElement ? document.activeElement : null;
      d.showModal();
      isOpen.current = true;
    }
    if (!open && d.open) {
      d.close();
      isOpen.current = false;
      giveFocusBack(d);
    }
  }, [open]); // eslint-disable-line react-hooks/exhaustive-deps

  // A dialog removed from the page while open (its parent stopped rendering it) gives focus back too.
  useEffect(() => {
    const d = ref.current;
    return () => {
      if (!d || !isOpen.current) return;
      isOpen.current = false;
      if (d.open) d.close();
      giveFocusBack(d);
    };
  }, []); // eslint-disable-line react-hooks/exhaustive-deps
}
