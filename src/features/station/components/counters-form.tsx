import { useState } from 'react';
import type { MeterRow } from '../../../../shared/schemas/machines';
import { Button } from '../../../components/ui/button';
import { Notice } from '../../../components/ui/notice';
import { ApiError } from '../../../lib/api-client';
import { useRecordCounters } from '../api/record-counters';
import { ResetChoice } from './change-form';
import { useShopFormat } from '../../../lib/format';

/** Type in what the control shows for any of the station's meters; empty fields are skipped. */
export function CountersForm({ meters }: { meters: MeterRow[] }) {
  const f = useShopFormat();
  const record = useRecordCounters();
  const [values, setValues] = useState<Record<string, string>>({});
  const [resets, setResets] = useState<Record<string, boolean>>({});
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [message, setMessage] = useState<{ tone: 'safe' | 'danger'; text: string } | null>(null);
  const filled = meters.filter((m) => (values[m.id] ?? '').trim() !== '');
  const submit = async (e: React.FormEvent) => {
    e.preventDefault();
    setMessage(null);
    setErrors({});
    const bad = filled.filter((m) => !Number.isFinite(Number(values[m.id])));
    if (bad.length) return setErrors(Object.fromEntries(bad.map((m) => [m.id, 'Enter a number'])));
    try {
      await record.mutateAsync({ readings: filled.map((m) => ({ meterId: m.id, value: Number(values[m.id]), isReset: !!resets[m.id] })) });
      setMessage({ tone: 'safe', text: `Recorded ${filled.length} reading${filled.length === 1 ? '' : 's'}.` });
      setValues({});
      setResets({});
    } catch (err) {
      if (err instanceof ApiError && err.fields.length) {
        // Field paths are readings.<i>.value, in the order sent.
        setErrors(Object.fromEntries(err.fields.map((f) => [filled[Number(f.path.split('.')[1])]?.id ?? '', f.message])));
      }
      setMessage({ tone: 'danger', text: err instanceof Error ? `Nothing recorded. ${err.message}` : 'Nothing recorded' });
    }
  };
  return (
    <form onSubmit={submit} noValidate aria-label="Record counters" className="space-y-3">
      {message ? (
        <Notice tone={message.tone} role="status">
          {message.text}
        </Notice>
      ) : null}
      <div className="grid gap-3 sm:grid-cols-2">
        {meters.map((m) => (
          <div key={m.id} className="space-y-1">
            <label htmlFor={`counter-${m.id}`} className="block text-sm font-semibold text-steel-800">
              {m.machineCode} · {m.name} ({m.unit})
            </label>
            <input
              id={`counter-${m.id}`}
              inputMode="decimal"
              autoComplete="off"
              value={values[m.id] ?? ''}
              onChange={(ev) => setValues((v) => ({ ...v, [m.id]: ev.target.value }))}
              aria-invalid={errors[m.id] ? true : undefined}
              aria-describedby={`counter-${m.id}-hint`}
              className={`block min-h-touch w-full rounded border bg-white px-3 ${errors[m.id] ? 'border-danger ring-1 ring-danger' : 'border-steel-400'}`}
            />
            {errors[m.id] ? (
              <p role="alert" className="text-sm font-semibold text-danger">
                {errors[m.id]}
              </p>
            ) : (
              <p id={`counter-${m.id}-hint`} className="text-sm text-steel-600">
                {m.latest ? `Last ${f.number(m.latest.value)} ${m.unit}` : 'No reading yet'}
              </p>
            )}
            {m.kind !== 'condition' ? (
              <ResetChoice id={`counter-${m.id}-reset`} checked={!!resets[m.id]} onChange={(ev) => setResets((r) => ({ ...r, [m.id]: ev.target.checked }))} />
            ) : null}
          </div>
        ))}
      </div>
      <Button type="submit" disabled={filled.length === 0} busy={record.isPending}>
        Record {filled.length || ''} reading{filled.length === 1 ? '' : 's'}
      </Button>
    </form>
  );
}
