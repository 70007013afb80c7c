import { forwardRef, useEffect, useSyncExternalStore, type ReactNode } from 'react';
import { Notice } from './notice';

/*
 * Screen readers announce a live region only when its text changes after the region is on the
 * page; a region rendered together with its text is often read by no one. So the regions here
 * are rendered empty, early, and stay.
 */

let current = '';
const listeners = new Set<() => void>();

/**
 * Says a result out loud through the page's own live region (rendered by the layout), for a
 * confirmation whose panel goes away with the action ("Signed off" closes the sign-off panel).
 */
export function announce(text: string) {
  // The same words twice in a row are no change to a live region: a no-break space tells them apart.
  current = current === text ? `${text}\u00a0` : text;
  listeners.forEach((l) => l());
}

const subscribe = (l: () => void) => (listeners.add(l), () => listeners.delete(l));

/** The page-wide announcer; the layout renders one, before anything is announced. */
export function Announcer() {
  const text = useSyncExternalStore(
    subscribe,
    () => current,
    () => '',
  );
  // A message from an earlier page is not repeated on the next one.
  useEffect(() => () => void (current = ''), []);
  return (
    <div role="status" aria-live="polite" aria-atomic="true" className="sr-only" data-announcer="">
      {text}
    </div>
  );
}

type Tone = 'danger' | 'caution' | 'mandatory' | 'safe' | 'info';

/**
 * A confirmation or error shown where the action happened, inside a live region that is on the
 * page before the message: the message is announced as it appears. Focusable (tabIndex −1) so an
 * action whose control goes away can hand focus to its result.
 */
export const LiveNotice = forwardRef<HTMLDivElement, { message: { tone: Tone; text: ReactNode; title?: string } | null; className?: string }>(
  function LiveNotice({ message, className = '' }, ref) {
    return (
      <div ref={ref} tabIndex={-1} role="status" aria-live="polite" className={`${message ? '' : 'sr-only'} ${className}`}>
        {message ? (
          <Notice tone={message.tone} title={message.title}>
            {message.text}
          </Notice>
        ) : null}
      </div>
    );
  },
);

/** Focuses an element once React has put it on the page (the next frame), if it is there. */
export function focusSoon(get: () => HTMLElement | null | undefined) {
  requestAnimationFrame(() =>
    requestAnimationFrame(() => {
      const el = get();
      if (el && el.isConnected) el.focus();
    }),
  );
}

/**
 * Focuses an element once `pressed` has left the page: a button that goes away with its action
 * (Start becomes Pause) only goes when the refetched data is rendered, which on a busy device can
 * take longer than a frame or two. Gives up waiting after about two seconds and focuses anyway.
 */
export function focusWhenGone(pressed: Element | null, get: () => HTMLElement | null | undefined, framesLeft = 120) {
  requestAnimationFrame(() => {
    if (pressed?.isConnected && framesLeft > 0) return focusWhenGone(pressed, get, framesLeft - 1);
    const el = get();
    if (el && el.isConnected) el.focus();
  });
}
