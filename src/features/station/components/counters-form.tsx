import { useState } from 'react';
import type { MeterRow } from '../../../../shared/schemas/machines';
import { Button } from '../../../components/ui/button';
import { Notice } from '../../../components/ui/notice';
import { ApiError, isPassingOutage } from '../../../lib/api-client';
import { selectOnFocus } from '../../../lib/select-on-focus';
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
  const [message, setMessage] = useState<{ tone: 'safe' | 'caution' | 'danger'; text: string } | null>(null);
  const filled = meters.filter((m) => (values[m.id] ?? '').trim() !== '');
  const label = (id: string) => {
    const m = meters.find((x) => x.id === id);
    return m ? `${m.machineCode} · ${m.name}` : 'a counter';
  };
  const submit = async (e: React.FormEvent) => {
    e.preventDefault();
    setMessage(null);
    setErrors({});
    const bad = filled.filter((m) => !Number.isFinite(Number(values[m.id])));
    if (bad.length) return setErrors(Object.fromEntries(bad.map((m) => [m.id, 'Enter a number'])));
    try {
      // Keep the good readings when one beside them is refused; the refused ones stay in their fields.
      const res = await record.mutateAsync({
        keepValid: true,
        readings: filled.map((m) => ({ meterId: m.id, value: Number(values[m.id]), isReset: !!resets[m.id] })),
      });
      const kept = new Set(res.kept);
      setValues((v) => Object.fromEntries(Object.entries(v).filter(([id]) => !kept.has(id))));
      setResets((r) => Object.fromEntries(Object.entries(r).filter(([id]) => !kept.has(id))));
      setErrors(Object.fromEntries(res.refused.map((f) => [f.meterId, f.message])));
      const refusedText = `Not recorded: ${res.refused.map((f) => label(f.meterId)).join(', ')} (see the field).`;
      if (!res.kept.length) return setMessage({ tone: 'danger', text: `Nothing recorded. ${refusedText}` });
      const keptText = `Recorded ${res.kept.length} reading${res.kept.length === 1 ? '' : 's'}: ${res.kept.map(label).join(', ')}.`;
      setMessage(res.refused.length ? { tone: 'caution', text: `${keptText} ${refusedText}` } : { tone: 'safe', text: keptText });
    } catch (err) {
      if (err instanceof ApiError && err.fields.length) {
        // Field paths are readings.<i>.value, in the order sent.
        setErrors(Object.fromEntries(err.fields.map((f) => [filled[Number(f.path.split('.')[1])]?.id ?? '', f.message])));
      }
      setMessage({ tone: isPassingOutage(err) ? 'caution' : 'danger', text: err instanceof Error ? `Nothing recorded. ${err.message}` : 'Nothing recorded' });
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
              onFocus={selectOnFocus}
              aria-invalid={errors[m.id] ? true : undefined}
              aria-describedby={errors[m.id] ? `counter-${m.id}-error` : `counter-${m.id}-hint`}
              className={`block min-h-touch w-full rounded border bg-white px-3 ${errors[m.id] ? 'border-danger ring-1 ring-danger' : 'border-steel-400'}`}
            />
            {errors[m.id] ? (
              <p id={`counter-${m.id}-error`} role="alert" className="text-sm font-semibold text-danger">
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
