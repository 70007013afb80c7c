import { useState } from 'react';
import { Notice } from '../../../components/ui/notice';
import { Button } from '../../../components/ui/button';
import { useConsumableSettings, useUpdateConsumableSettings, type ConsumableReference } from '../api/consumable-settings';

const LABELS: Record<keyof ConsumableReference, string> = {
  electrodePitLimitMm: 'Electrode pit depth to change at (mm)',
  cutToleranceMm: 'Test coupon tolerance ± (mm)',
  changeTargetReliability: 'Plan changes where this share still runs (0.5–0.99)',
};

/** The values Kerfbook works with, where each comes from, and (for admins) the site's own. */
export function ReferenceValues({ canEdit }: { canEdit: boolean }) {
  const q = useConsumableSettings();
  const update = useUpdateConsumableSettings();
  const [draft, setDraft] = useState<Partial<Record<keyof ConsumableReference, string>>>({});
  const [message, setMessage] = useState<{ tone: 'safe' | 'danger'; text: string } | null>(null);
  if (q.isError) return <Notice tone="danger">{q.error.message}</Notice>;
  if (!q.data) return <p role="status">Loading…</p>;
  const save = async (key: keyof ConsumableReference, value: number | null) => {
    setMessage(null);
    try {
      await update.mutateAsync({ [key]: value });
      setDraft((d) => ({ ...d, [key]: undefined }));
      setMessage({ tone: 'safe', text: value === null ? 'Back to the default.' : 'Saved for this site.' });
    } catch (err) {
      setMessage({ tone: 'danger', text: err instanceof Error ? err.message : 'Could not save' });
    }
  };
  return (
    <div className="space-y-3">
      {message ? (
        <Notice tone={message.tone} role="status">
          {message.text}
        </Notice>
      ) : null}
      <ul className="divide-y divide-steel-200">
        {(Object.keys(LABELS) as (keyof ConsumableReference)[]).map((key) => {
          const v = q.data[key];
          return (
            <li key={key} className="flex flex-wrap items-end justify-between gap-3 py-3">
              <div className="min-w-64 flex-1">
                <p className="font-semibold">
                  {LABELS[key]}:{' '}
                  <span className="tabular-nums">
                    {v.value}
                    {v.unit ? ` ${v.unit}` : ''}
                  </span>
                </p>
                <p className="text-sm text-steel-700">Source: {v.source}</p>
              </div>
              {canEdit ? (
                <div className="flex flex-wrap items-end gap-2">
                  <label className="flex flex-col text-sm font-semibold">
                    Site value
                    <input
                      inputMode="decimal"
                      className="min-h-touch w-28 rounded border border-steel-400 px-2 font-normal"
                      value={draft[key] ?? ''}
                      placeholder={String(v.value)}
                      onChange={(e) => setDraft((d) => ({ ...d, [key]: e.target.value }))}
                    />
                  </label>
                  <Button variant="secondary" disabled={!draft[key] || update.isPending} onClick={() => save(key, Number(draft[key]))}>
                    Save
                  </Button>
                  {v.overridden ? (
                    <Button variant="ghost" disabled={update.isPending} onClick={() => save(key, null)}>
                      Use default
                    </Button>
                  ) : null}
                </div>
              ) : null}
            </li>
          );
        })}
      </ul>
    </div>
  );
}
