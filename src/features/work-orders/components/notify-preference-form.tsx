import { useEffect, useState } from 'react';
import { NOTIFY_MODES, NOTIFY_MODE_LABELS, type NotifyMode } from '../../../../shared/schemas/work-orders';
import { Button } from '../../../components/ui/button';
import { Notice } from '../../../components/ui/notice';
import { useNotifyPreference } from '../api/get-notify-preference';
import { useSetNotifyPreference } from '../api/set-notify-preference';
import { inputClass } from './format';

/** How often Kerfbook mails me about work; past-due safety work is always mailed. */
export function NotifyPreferenceForm() {
  const q = useNotifyPreference();
  const save = useSetNotifyPreference();
  const [mode, setMode] = useState<NotifyMode>('immediate');
  const [hour, setHour] = useState(6);
  const [message, setMessage] = useState<{ tone: 'danger' | 'safe'; text: string } | null>(null);
  useEffect(() => {
    if (q.data) {
      setMode(q.data.mode);
      setHour(q.data.digestHour);
    }
  }, [q.data]);
  if (!q.data) return <p role="status">Loading…</p>;
  const submit = async (e: React.FormEvent) => {
    e.preventDefault();
    setMessage(null);
    try {
      await save.mutateAsync({ mode, digestHour: hour });
      setMessage({ tone: 'safe', text: 'Saved.' });
    } catch (err) {
      setMessage({ tone: 'danger', text: err instanceof Error ? err.message : 'Could not save' });
    }
  };
  return (
    <form onSubmit={submit} aria-label="Work notices" className="space-y-4">
      <fieldset className="space-y-2">
        <legend className="font-semibold">Mail me about new work</legend>
        {NOTIFY_MODES.map((m) => (
          <label key={m} className="flex min-h-touch items-center gap-3">
            <input type="radio" name="notify-mode" value={m} checked={mode === m} onChange={() => setMode(m)} className="h-6 w-6" />
            {NOTIFY_MODE_LABELS[m]}
          </label>
        ))}
      </fieldset>
      {mode === 'daily' ? (
        <div className="max-w-xs">
          <label htmlFor="digest-hour" className="block text-sm font-semibold">
            Send the summary after (site time, {q.data.timeZone})
          </label>
          <select id="digest-hour" className={inputClass} value={hour} onChange={(e) => setHour(Number(e.target.value))}>
            {Array.from({ length: 24 }, (_, h) => (
              <option key={h} value={h}>
                {String(h).padStart(2, '0')}:00
              </option>
            ))}
          </select>
        </div>
      ) : null}
      <Notice tone="mandatory" title="Always sent">
        Notices about past-due safety work reach you whatever you choose here.
      </Notice>
      <Button type="submit" busy={save.isPending}>
        Save
      </Button>
      {message ? (
        <Notice tone={message.tone} role={message.tone === 'danger' ? 'alert' : 'status'}>
          {message.text}
        </Notice>
      ) : null}
    </form>
  );
}
