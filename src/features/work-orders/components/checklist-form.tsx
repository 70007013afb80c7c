import { useEffect, useRef, useState } from 'react';
import { useForm, useWatch } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { CHECK_RESULTS, CHECK_RESULT_LABELS, checklistResultsInput, type ChecklistLine } from '../../../../shared/schemas/work-orders';
import { Notice } from '../../../components/ui/notice';
import { ApiError } from '../../../lib/api-client';
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

/** Answer each line OK / Not OK / Not applicable; each answer is saved as it is given (values and notes when the field is left). */
export function ChecklistForm({ workOrderId, lines, readOnly }: { workOrderId: string; lines: ChecklistLine[]; readOnly: boolean }) {
  const save = useSaveChecklist();
  const [message, setMessage] = useState<{ tone: 'danger' | 'safe'; text: string } | null>(null);
  const [pending, setPending] = useState(0);
  const queue = useRef<Promise<unknown>>(Promise.resolve());
  const defaults = { results: lines.map((l) => ({ key: l.key, result: l.result, value: l.value, note: l.note })) };
  const { register, setError, clearErrors, formState, control, reset, getValues, setValue } = useForm<In, unknown, Out>({
    resolver: zodResolver(checklistResultsInput),
    defaultValues: defaults,
  });
  // Server state wins after a save (other people may answer lines too); a field being edited keeps its text.
  useEffect(() => reset(defaults, { keepDirtyValues: true, keepErrors: true }), [JSON.stringify(lines)]); // eslint-disable-line react-hooks/exhaustive-deps
  const values = useWatch({ control, name: 'results' });
  // Warn before leaving while an answer is still on its way.
  useEffect(() => {
    if (!pending) return;
    const warn = (e: BeforeUnloadEvent) => e.preventDefault();
    window.addEventListener('beforeunload', warn);
    return () => window.removeEventListener('beforeunload', warn);
  }, [pending]);
  /** One request per change, one after another so a later answer never lands before an earlier one. */
  const saveLine = (i: number, onlyIfChanged = false) => {
    const v = getValues(`results.${i}`);
    if (onlyIfChanged && lines[i] && (v.value ?? null) === (lines[i].value ?? null) && (v.note || null) === (lines[i].note || null)) return;
    const value = v.value === undefined || v.value === null ? null : Number(v.value);
    if (value !== null && !Number.isFinite(value)) {
      setError(`results.${i}.value`, { type: 'client', message: 'Enter a number' });
      return;
    }
    clearErrors(`results.${i}`);
    const line = { key: v.key, result: v.result ?? null, value, note: v.note ? v.note : null };
    const before = lines[i];
    setPending((n) => n + 1);
    setMessage(null);
    queue.current = queue.current.then(async () => {
      try {
        const r = await save.mutateAsync({ id: workOrderId, results: [line] });
        const open = r.checklist.filter((c) => c.result === null).length;
        setMessage({ tone: 'safe', text: open ? `Saved. ${open} line${open === 1 ? '' : 's'} still to answer.` : 'Saved. Every line is answered.' });
      } catch (err) {
        // Put the line back as it was last saved, and say why.
        if (before) setValue(`results.${i}`, { key: before.key, result: before.result, value: before.value, note: before.note });
        // One line is sent at a time, so its field errors belong to line i.
        const fieldMsg = err instanceof ApiError ? err.fields[0]?.message : undefined;
        if (fieldMsg) setError(`results.${i}.result`, { type: 'server', message: fieldMsg });
        const text = err instanceof ApiError ? err.message : 'Could not reach the server. Check the connection and try again.';
        setMessage({ tone: 'danger', text: `Not saved: “${before?.label ?? 'this line'}” is back to its last saved answer. ${fieldMsg ?? text}` });
      } finally {
        setPending((n) => n - 1);
      }
    });
  };
  if (lines.length === 0) return <p className="text-steel-600">This work order has no checklist.</p>;
  const answered = (values ?? []).filter((r) => r?.result).length;
  return (
    <form onSubmit={(e) => e.preventDefault()} noValidate aria-label="Checklist" className="space-y-4">
      <p className="text-sm font-semibold text-steel-700" aria-live="polite">
        {answered} of {lines.length} answered
      </p>
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
                      <input type="radio" value={r} className="peer sr-only" {...register(`results.${i}.result`, { onChange: () => saveLine(i) })} />
                      <span
                        className={`flex min-h-touch min-w-24 cursor-pointer items-center justify-center rounded border-2 border-steel-400 bg-white px-4 font-semibold peer-focus-visible:outline-3 peer-focus-visible:outline-offset-2 peer-focus-visible:outline-mandatory ${toneOf[r]}`}
                      >
                        {CHECK_RESULT_LABELS[r]}
                      </span>
                    </label>
                  ))}
                </div>
                {c.kind === 'measure' ? (
                  <div className="mt-3 grid gap-2 sm:grid-cols-[12rem_1fr] sm:items-end">
                    <div>
                      <label htmlFor={`cl-${c.key}-value`} className="block text-sm font-semibold">
                        Measured ({c.unit})
                      </label>
                      <input
                        id={`cl-${c.key}-value`}
                        inputMode="decimal"
                        className={inputClass}
                        aria-invalid={off || !!err?.value || undefined}
                        {...register(`results.${i}.value`, {
                          onBlur: () => saveLine(i, true),
                          setValueAs: (x) => (x === '' || x === null || x === undefined ? null : Number(String(x).replace(',', '.'))),
                        })}
                      />
                    </div>
                    {off ? (
                      <p className="text-sm font-semibold text-danger" role="status">
                        Outside the limits: mark this line Not OK and say what you did in the note.
                      </p>
                    ) : null}
                  </div>
                ) : null}
                <div className="mt-2">
                  <label htmlFor={`cl-${c.key}-note`} className="block text-sm font-semibold">
                    Note (optional)
                  </label>
                  <input
                    id={`cl-${c.key}-note`}
                    className={inputClass}
                    {...register(`results.${i}.note`, { onBlur: () => saveLine(i, true), setValueAs: (x) => (x ? x : null) })}
                  />
                </div>
                {err?.result?.message || err?.value?.message ? (
                  <p className="mt-1 text-sm font-semibold text-danger" role="alert">
                    {err?.result?.message ?? err?.value?.message}
                  </p>
                ) : null}
              </fieldset>
            </li>
          );
        })}
      </ol>
      {message ? (
        <Notice tone={message.tone} role={message.tone === 'danger' ? 'alert' : 'status'}>
          {message.text}
        </Notice>
      ) : null}
      {readOnly ? null : (
        <p className="text-sm text-steel-600" role="status" aria-live="polite">
          {pending ? 'Saving answers…' : 'Each answer is saved as you give it; measured values and notes when you leave the field.'}
        </p>
      )}
    </form>
  );
}
