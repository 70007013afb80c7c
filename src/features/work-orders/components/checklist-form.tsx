import { useEffect, useState } from 'react';
import { useForm, useWatch } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { CHECK_RESULTS, CHECK_RESULT_LABELS, checklistResultsInput, type ChecklistLine } from '../../../../shared/schemas/work-orders';
import { Button } from '../../../components/ui/button';
import { Notice } from '../../../components/ui/notice';
import { applyServerErrors } from '../../../lib/form-errors';
import { useSaveChecklist } from '../api/save-checklist';
import { inputClass } from './format';

type In = z.input<typeof checklistResultsInput>;
type Out = z.output<typeof checklistResultsInput>;

const toneOf: Record<string, string> = {
  pass: 'peer-checked:border-safe peer-checked:bg-safe peer-checked:text-white',
  fail: 'peer-checked:border-danger peer-checked:bg-danger peer-checked:text-white',
  na: 'peer-checked:border-steel-700 peer-checked:bg-steel-700 peer-checked:text-white',
};

function limitsText(c: ChecklistLine) {
  if (c.kind !== 'measure') return null;
  if (c.min !== undefined && c.max !== undefined) return `${c.min} to ${c.max} ${c.unit ?? ''}`;
  if (c.min !== undefined) return `at least ${c.min} ${c.unit ?? ''}`;
  if (c.max !== undefined) return `at most ${c.max} ${c.unit ?? ''}`;
  return c.unit ?? '';
}

const outside = (c: ChecklistLine, v: number | null | undefined) =>
  v !== null && v !== undefined && !Number.isNaN(v) && ((c.min !== undefined && v < c.min) || (c.max !== undefined && v > c.max));

/** Answer each line OK / Not OK / Not applicable; measured lines take the value and are checked against their limits. */
export function ChecklistForm({ workOrderId, lines, readOnly }: { workOrderId: string; lines: ChecklistLine[]; readOnly: boolean }) {
  const save = useSaveChecklist();
  const [message, setMessage] = useState<{ tone: 'danger' | 'safe'; text: string } | null>(null);
  const defaults = { results: lines.map((l) => ({ key: l.key, result: l.result, value: l.value, note: l.note })) };
  const { register, handleSubmit, setError, formState, control, reset } = useForm<In, unknown, Out>({ resolver: zodResolver(checklistResultsInput), defaultValues: defaults });
  // Server state wins after a save (other people may answer lines too).
  useEffect(() => reset(defaults), [JSON.stringify(lines)]); // eslint-disable-line react-hooks/exhaustive-deps
  const values = useWatch({ control, name: 'results' });
  const onSubmit = handleSubmit(async (v) => {
    setMessage(null);
    try {
      await save.mutateAsync({ id: workOrderId, results: v.results });
      const open = v.results.filter((r) => r.result === null).length;
      setMessage({ tone: 'safe', text: open ? `Saved. ${open} line${open === 1 ? '' : 's'} still to answer.` : 'Saved. Every line is answered.' });
    } catch (err) {
      const paths = lines.flatMap((_, i) => [`results.${i}.result`, `results.${i}.value`, `results.${i}.key`]);
      setMessage({ tone: 'danger', text: applyServerErrors(err, setError, paths) ?? 'Some answers need another look (marked below).' });
    }
  });
  if (lines.length === 0) return <p className="text-steel-600">This work order has no checklist.</p>;
  const answered = (values ?? []).filter((r) => r?.result).length;
  return (
    <form onSubmit={onSubmit} noValidate aria-label="Checklist" className="space-y-4">
      <p className="text-sm font-semibold text-steel-700" aria-live="polite">{answered} of {lines.length} answered</p>
      <ol className="space-y-3">
        {lines.map((c, i) => {
          const v = values?.[i];
          const err = formState.errors.results?.[i];
          const value = typeof v?.value === 'number' ? v.value : null;
          const off = outside(c, value);
          return (
            <li key={c.key} className={`rounded border p-3 ${err ? 'border-danger' : 'border-steel-200'} bg-white`}>
              <fieldset disabled={readOnly}>
                <legend className="font-semibold">
                  {i + 1}. {c.label}
                </legend>
                {c.kind === 'measure' ? <p className="text-sm text-steel-600">Limits: {limitsText(c)}</p> : null}
                <input type="hidden" {...register(`results.${i}.key`)} />
                <div className="mt-2 flex flex-wrap gap-2" role="radiogroup" aria-label={`Answer for ${c.label}`}>
                  {CHECK_RESULTS.map((r) => (
                    <label key={r} className="relative">
                      <input type="radio" value={r} className="peer sr-only" {...register(`results.${i}.result`)} />
                      <span className={`flex min-h-touch min-w-24 cursor-pointer items-center justify-center rounded border-2 border-steel-400 bg-white px-4 font-semibold peer-focus-visible:outline-3 peer-focus-visible:outline-offset-2 peer-focus-visible:outline-mandatory ${toneOf[r]}`}>
                        {CHECK_RESULT_LABELS[r]}
                      </span>
                    </label>
                  ))}
                </div>
                {c.kind === 'measure' ? (
                  <div className="mt-3 grid gap-2 sm:grid-cols-[12rem_1fr] sm:items-end">
                    <div>
                      <label htmlFor={`cl-${c.key}-value`} className="block text-sm font-semibold">Measured ({c.unit})</label>
                      <input
                        id={`cl-${c.key}-value`}
                        inputMode="decimal"
                        className={inputClass}
                        aria-invalid={off || !!err?.value || undefined}
                        {...register(`results.${i}.value`, { setValueAs: (x) => (x === '' || x === null || x === undefined ? null : Number(String(x).replace(',', '.'))) })}
                      />
                    </div>
                    {off ? (
                      <p className="text-sm font-semibold text-danger" role="status">Outside the limits: mark this line Not OK and say what you did in the note.</p>
                    ) : null}
                  </div>
                ) : null}
                <div className="mt-2">
                  <label htmlFor={`cl-${c.key}-note`} className="block text-sm font-semibold">Note (optional)</label>
                  <input id={`cl-${c.key}-note`} className={inputClass} {...register(`results.${i}.note`, { setValueAs: (x) => (x ? x : null) })} />
                </div>
                {err?.result?.message || err?.value?.message ? (
                  <p className="mt-1 text-sm font-semibold text-danger" role="alert">{err?.result?.message ?? err?.value?.message}</p>
                ) : null}
              </fieldset>
            </li>
          );
        })}
      </ol>
      {message ? <Notice tone={message.tone} role={message.tone === 'danger' ? 'alert' : 'status'}>{message.text}</Notice> : null}
      {readOnly ? null : <Button type="submit" busy={formState.isSubmitting}>Save checklist</Button>}
    </form>
  );
}
