import { useState } from 'react';
import { Notice, Panel } from '../../../components/ui/notice';
import { Button } from '../../../components/ui/button';
import { WorkCaution } from '../../../components/ui/caution';
import { ApiError } from '../../../lib/api-client';
import { useShopFormat } from '../../../lib/format';
import type { Role } from '../../../../shared/permissions';
import type { PreUseLine } from '../../../../shared/domain/pre-use-checks';
import type { PreUseCheckResult } from '../../../../shared/schemas/pre-use-checks';
import { usePreUseCheck } from '../api/get-pre-use-check';
import { useRecordPreUseCheck } from '../api/record-pre-use-check';
import { useSignFlow } from './sign-dialog';

type Answer = { ok?: boolean; value: string };

const choice = 'min-h-14 min-w-28 rounded border-2 px-4 text-lg font-bold';

/** The reading's verdict as typed, before signing: the server judges again on the same limits. */
function readingProblem(line: PreUseLine, raw: string): string | null {
  if (!line.reading || raw.trim() === '') return null;
  const v = Number(raw.replace(',', '.'));
  if (!Number.isFinite(v) || v < 0) return 'Enter the reading as a number';
  if (line.reading.max !== null && v > line.reading.max) return `Above the ${line.reading.max} ${line.reading.unit} limit: this line fails`;
  if (line.reading.min !== null && v < line.reading.min) return `Below the ${line.reading.min} ${line.reading.unit} limit: this line fails`;
  return null;
}

/** The shift's pre-use check at one machine: OK / Not OK per line, the reading where asked, then sign. */
export function PreUseCheckForm({ code, me, onSigned }: { code: string; me: { name: string; role: Role }; onSigned: (r: PreUseCheckResult) => void }) {
  const f = useShopFormat();
  const q = usePreUseCheck(code);
  const record = useRecordPreUseCheck(code);
  const { sign, dialog } = useSignFlow(me);
  const [answers, setAnswers] = useState<Record<string, Answer>>({});
  const [error, setError] = useState<string | null>(null);

  if (q.isError) return <Notice tone="danger">{q.error.message}</Notice>;
  if (!q.data) return <p role="status">Loading the check…</p>;
  const view = q.data;
  if (!view.lines)
    return (
      <Notice title="No pre-use check for this machine">
        {view.machineCode} has no pre-use check list: its kind of machine is not checked at the start of a shift.
      </Notice>
    );
  const lines = view.lines;
  const answer = (c: string): Answer => answers[c] ?? { value: '' };
  const set = (c: string, patch: Partial<Answer>) => setAnswers((a) => ({ ...a, [c]: { ...answer(c), ...patch } }));
  const unanswered = lines.filter((l) => answer(l.code).ok === undefined || (l.reading && answer(l.code).value.trim() === ''));
  const failing = lines.filter((l) => answer(l.code).ok === false || readingProblem(l, answer(l.code).value));
  const criticalFailing = failing.filter((l) => l.safetyCritical);
  const badNumber = lines.some((l) => readingProblem(l, answer(l.code).value) === 'Enter the reading as a number');
  const last = view.history[0];

  const submit = () =>
    sign(
      'pre-use-check-done',
      async (password) => {
        setError(null);
        const result = await record.mutateAsync({
          answers: lines.map((l) => ({
            code: l.code,
            ok: answer(l.code).ok === true,
            value: l.reading ? Number(answer(l.code).value.replace(',', '.')) : null,
          })),
          password,
        });
        onSigned(result);
      },
      { onError: (err) => setError(err instanceof ApiError ? err.message : 'Could not reach the server; the check was not recorded.') },
    );

  return (
    <div className="space-y-4">
      <WorkCaution />
      {error ? (
        <Notice tone="danger" role="alert">
          {error}
        </Notice>
      ) : null}
      {last && view.checkedToday ? (
        <Notice tone="safe" title="Checked today">
          {last.checkedBy} signed a check at {f.time(last.checkedAt)}
          {last.pass ? ' with every line OK' : ` with ${last.lines.filter((l) => !l.ok).length} line(s) not OK`}. A new shift checks again.
        </Notice>
      ) : null}
      {view.status.state !== 'in-service' ? (
        <Notice tone="caution" title="This machine is not in service">
          {view.status.reason ?? 'It is stopped.'} Do not run it until it is back in service.
        </Notice>
      ) : null}
      <ol className="space-y-3">
        {lines.map((l, i) => {
          const a = answer(l.code);
          const problem = readingProblem(l, a.value);
          const inputId = `pre-use-${l.code}`;
          return (
            <li key={l.code} className="rounded border border-steel-300 bg-white p-4">
              <fieldset>
                <legend className="text-lg font-semibold text-steel-900">
                  {i + 1}. {l.label}
                  {l.safetyCritical ? (
                    <span className="ml-2 inline-block rounded border border-danger bg-danger-soft px-2 py-0.5 align-middle text-xs font-bold uppercase text-danger-ink">
                      Safety-critical
                    </span>
                  ) : null}
                </legend>
                {l.reading ? (
                  <div className="mt-3">
                    <label htmlFor={inputId} className="block font-semibold">
                      Reading ({l.reading.unit})
                    </label>
                    <input
                      id={inputId}
                      inputMode="decimal"
                      autoComplete="off"
                      value={a.value}
                      onChange={(e) => set(l.code, { value: e.target.value })}
                      aria-describedby={`${inputId}-limit`}
                      aria-invalid={problem ? true : undefined}
                      className="mt-1 min-h-14 w-48 rounded border-2 border-steel-400 px-3 text-xl"
                    />
                    <span className="ml-2 text-lg">{l.reading.unit}</span>
                    <p id={`${inputId}-limit`} className={`mt-1 text-sm ${problem ? 'font-semibold text-danger-ink' : 'text-steel-700'}`}>
                      {problem ??
                        [l.reading.min !== null ? `at least ${l.reading.min}` : null, l.reading.max !== null ? `at most ${l.reading.max}` : null]
                          .filter(Boolean)
                          .join(', ')
                          .replace(/^./, (c) => c.toUpperCase()) + ` ${l.reading.unit}. Source: ${l.reading.source}.`}
                    </p>
                  </div>
                ) : null}
                <div className="mt-3 flex flex-wrap gap-3">
                  <button
                    type="button"
                    aria-pressed={a.ok === true}
                    onClick={() => set(l.code, { ok: true })}
                    className={`${choice} ${a.ok === true ? 'border-safe bg-safe text-white' : 'border-steel-400 bg-white text-steel-900'}`}
                  >
                    OK
                  </button>
                  <button
                    type="button"
                    aria-pressed={a.ok === false}
                    onClick={() => set(l.code, { ok: false })}
                    className={`${choice} ${a.ok === false ? 'border-danger bg-danger text-white' : 'border-steel-400 bg-white text-steel-900'}`}
                  >
                    Not OK
                  </button>
                </div>
              </fieldset>
            </li>
          );
        })}
      </ol>
      {criticalFailing.length ? (
        <Notice tone="danger" title="Do not run this machine">
          Not OK: {criticalFailing.map((l) => l.label).join('; ')}. Signing takes {view.machineCode} out of service and raises a repair for the technicians.
        </Notice>
      ) : failing.length ? (
        <Notice tone="caution" title="A line is not OK">
          Signing raises a repair for {failing.map((l) => l.label.toLowerCase()).join('; ')}. The machine stays in service.
        </Notice>
      ) : null}
      {unanswered.length ? <p className="text-steel-700">Still to answer: {unanswered.map((l) => lines.indexOf(l) + 1).join(', ')}.</p> : null}
      <Button className="min-h-16 w-full text-lg" disabled={unanswered.length > 0 || badNumber} busy={record.isPending} onClick={submit}>
        Sign: pre-use check done
      </Button>
      {view.history.length ? (
        <Panel title="Latest checks">
          <ul className="divide-y divide-steel-200">
            {view.history.slice(0, 5).map((h) => (
              <li key={h.id} className="flex flex-wrap justify-between gap-2 px-4 py-2 text-sm">
                <span>
                  {f.dateTime(h.checkedAt)} · {h.checkedBy}
                </span>
                <span className={h.pass ? 'text-safe-ink' : 'font-semibold text-danger-ink'}>
                  {h.pass
                    ? 'All OK'
                    : `Not OK: ${h.lines
                        .filter((l) => !l.ok)
                        .map((l) => l.label)
                        .join('; ')}${h.workOrderNumber ? ` · WO ${h.workOrderNumber}` : ''}`}
                </span>
              </li>
            ))}
          </ul>
        </Panel>
      ) : null}
      {dialog}
    </div>
  );
}
