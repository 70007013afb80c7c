import { useRef, useState } from 'react';
import { Button } from '../../../components/ui/button';
import { Notice } from '../../../components/ui/notice';
import { ConfirmDialog } from '../../../components/ui/confirm-dialog';
import { useShopFormat } from '../../../lib/format';
import { useCalendarFeed } from '../api/get-calendar-feed';
import { useCreateCalendarFeed } from '../api/create-calendar-feed';
import { useRevokeCalendarFeed } from '../api/revoke-calendar-feed';

/** A private iCalendar address of my due work, shown once when made; revoking it stops it at once. */
export function CalendarFeedPanel() {
  // Site time, like every other time in Kerfbook, not the browser's zone.
  const f = useShopFormat();
  const q = useCalendarFeed();
  const create = useCreateCalendarFeed();
  const revoke = useRevokeCalendarFeed();
  const [url, setUrl] = useState<string | null>(null);
  const [copied, setCopied] = useState(false);
  const [confirm, setConfirm] = useState<'new' | 'revoke' | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [copyHint, setCopyHint] = useState<string | null>(null);
  const addressRef = useRef<HTMLInputElement>(null);
  if (q.isError)
    return (
      <Notice tone="danger" role="alert">
        Could not load your calendar feed: {q.error.message}
      </Notice>
    );
  if (!q.data) return <p role="status">Loading…</p>;
  const make = async () => {
    setConfirm(null);
    setError(null);
    try {
      const r = await create.mutateAsync();
      setUrl(r.url);
      setCopied(false);
      setCopyHint(null);
    } catch (err) {
      setError(`The calendar address was not made: ${err instanceof Error ? err.message : 'no answer from the server'}.`);
    }
  };
  // The clipboard API exists only on HTTPS (or localhost); a shop server on plain HTTP has none, so
  // say "Copied" only when it was, and otherwise leave the address selected for Ctrl+C / long-press.
  const copy = async () => {
    setCopyHint(null);
    try {
      if (!navigator.clipboard) throw new Error('no clipboard');
      await navigator.clipboard.writeText(url ?? '');
      setCopied(true);
    } catch {
      addressRef.current?.focus();
      addressRef.current?.select();
      setCopied(false);
      setCopyHint('This browser did not allow copying here. The address is selected: copy it with Ctrl+C, or press and hold it.');
    }
  };
  return (
    <div className="space-y-3">
      <p className="text-steel-700">
        Subscribe to this address in your calendar app to see your open work orders and plans coming up in the next 60 days. Anyone with the address can read
        it: keep it to yourself.
      </p>
      {url ? (
        <Notice tone="mandatory" title="Your calendar address (shown only now)">
          <div className="flex flex-wrap items-center gap-2">
            <input
              ref={addressRef}
              aria-label="Calendar address"
              readOnly
              value={url}
              className="min-h-touch w-full flex-1 rounded border border-steel-400 bg-white px-2 font-mono text-sm"
              onFocus={(e) => e.currentTarget.select()}
            />
            <Button variant="secondary" onClick={copy}>
              {copied ? 'Copied' : 'Copy'}
            </Button>
          </div>
          {copyHint ? (
            <p className="mt-2 text-sm font-semibold" role="status">
              {copyHint}
            </p>
          ) : null}
        </Notice>
      ) : null}
      {q.data.active ? (
        <p>
          Feed on since {f.dateTime(q.data.createdAt)}
          {q.data.lastUsedAt ? `; last read by a calendar ${f.dateTime(q.data.lastUsedAt)}` : '; not read by a calendar yet'}.
        </p>
      ) : (
        <p>No calendar feed is on.</p>
      )}
      {error ? (
        <Notice tone="danger" role="alert">
          {error}
        </Notice>
      ) : null}
      <div className="flex flex-wrap gap-2">
        <Button onClick={() => (q.data.active ? setConfirm('new') : make())} busy={create.isPending}>
          {q.data.active ? 'Make a new address' : 'Turn on my calendar feed'}
        </Button>
        {q.data.active ? (
          <Button variant="secondary" onClick={() => setConfirm('revoke')}>
            Turn off
          </Button>
        ) : null}
      </div>
      <ConfirmDialog
        open={confirm !== null}
        title={confirm === 'revoke' ? 'Turn off the calendar feed?' : 'Make a new address?'}
        confirmLabel={confirm === 'revoke' ? 'Turn off' : 'Make a new address'}
        tone={confirm === 'revoke' ? 'danger' : 'primary'}
        busy={create.isPending || revoke.isPending}
        onCancel={() => setConfirm(null)}
        onConfirm={async () => {
          if (confirm === 'revoke') {
            setError(null);
            try {
              await revoke.mutateAsync();
              setUrl(null);
            } catch (err) {
              setError(`The feed is still on: ${err instanceof Error ? err.message : 'no answer from the server'}.`);
            }
            setConfirm(null);
          } else await make();
        }}
      >
        The current address stops working at once; calendars using it will show nothing new.
      </ConfirmDialog>
    </div>
  );
}
