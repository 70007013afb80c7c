import { useState } from 'react';
import { Button } from '../../../components/ui/button';
import { EmptyState, FormMessages } from '../../../components/ui/notice';
import { ApiError } from '../../../lib/api-client';
import { FAILURE_CODE_CATEGORIES, FAILURE_CODE_CATEGORY_LABELS, type FailureCodeCategory, type FailureCodeRow } from '../../../../shared/schemas/failure-codes';
import { useFailureCodes } from '../api/get-reliability';
import { useCreateFailureCode, useUpdateFailureCode } from '../api/failure-codes';

const input = 'mt-1 block min-h-touch w-full rounded border border-steel-400 bg-white px-3 font-normal';
const messageOf = (err: unknown, fallback: string) =>
  err instanceof ApiError && err.fields.length ? err.fields.map((f) => f.message).join('; ') : err instanceof Error ? err.message : fallback;

function CodeRow({ code }: { code: FailureCodeRow }) {
  const update = useUpdateFailureCode();
  const [label, setLabel] = useState(code.label);
  const [error, setError] = useState<string | null>(null);
  const save = async (change: { label?: string; active?: boolean }) => {
    setError(null);
    try {
      await update.mutateAsync({ id: code.id, ...change });
    } catch (err) {
      setError(messageOf(err, 'Not saved'));
    }
  };
  return (
    <tr className={`border-b border-steel-200 ${code.active ? '' : 'text-steel-500'}`}>
      <td className="py-2 font-mono font-bold">{code.code}</td>
      <td>
        <label className="sr-only" htmlFor={`fc-${code.id}`}>
          Name of {code.code}
        </label>
        <input
          id={`fc-${code.id}`}
          className={input}
          value={label}
          onChange={(e) => setLabel(e.target.value)}
          onBlur={() => (label.trim() !== code.label ? save({ label }) : undefined)}
        />
        {error ? (
          <p role="alert" className="text-sm font-semibold text-danger">
            {error}
          </p>
        ) : null}
      </td>
      <td className="pl-2">
        <Button variant="secondary" busy={update.isPending} onClick={() => save({ active: !code.active })}>
          {code.active ? `Retire ${code.code}` : `Use ${code.code} again`}
        </Button>
      </td>
    </tr>
  );
}

/**
 * The shop's own failure-mode, cause and remedy codes. A code is retired rather than deleted,
 * so stops already coded with it keep their meaning.
 */
export function FailureCodesEditor() {
  const codes = useFailureCodes();
  const create = useCreateFailureCode();
  const [category, setCategory] = useState<FailureCodeCategory>('mode');
  const [code, setCode] = useState('');
  const [label, setLabel] = useState('');
  const [error, setError] = useState<string | null>(null);
  const [saved, setSaved] = useState<string | null>(null);
  const add = async (e: React.FormEvent) => {
    e.preventDefault();
    setError(null);
    setSaved(null);
    try {
      const row = await create.mutateAsync({ category, code, label });
      setSaved(`Added ${row.code} · ${row.label}.`);
      setCode('');
      setLabel('');
    } catch (err) {
      setError(messageOf(err, 'The code was not added'));
    }
  };
  return (
    <div className="space-y-4">
      <form onSubmit={add} noValidate aria-label="Add a code" className="grid items-end gap-3 md:grid-cols-[16rem_8rem_1fr_auto]">
        <label className="block text-sm font-semibold">
          List
          <select className={input} value={category} onChange={(e) => setCategory(e.target.value as FailureCodeCategory)}>
            {FAILURE_CODE_CATEGORIES.map((c) => (
              <option key={c} value={c}>
                {FAILURE_CODE_CATEGORY_LABELS[c]}
              </option>
            ))}
          </select>
        </label>
        <label className="block text-sm font-semibold">
          Code
          <input className={input} value={code} onChange={(e) => setCode(e.target.value)} autoComplete="off" />
        </label>
        <label className="block text-sm font-semibold">
          Name
          <input className={input} value={label} onChange={(e) => setLabel(e.target.value)} autoComplete="off" />
        </label>
        <Button type="submit" busy={create.isPending}>
          Add the code
        </Button>
        <div className="md:col-span-4">
          <FormMessages error={error} saved={saved} />
        </div>
      </form>
      {codes.data && codes.data.length === 0 ? <EmptyState title="No codes yet" /> : null}
      <div className="grid max-w-3xl gap-6">
        {FAILURE_CODE_CATEGORIES.map((c) => (
          <table key={c} className="w-full text-left text-sm">
            <caption className="pb-2 text-left text-base font-bold">{FAILURE_CODE_CATEGORY_LABELS[c]}</caption>
            <thead className="sr-only">
              <tr>
                <th scope="col">Code</th>
                <th scope="col">Name</th>
                <th scope="col">In use</th>
              </tr>
            </thead>
            <tbody>
              {(codes.data ?? [])
                .filter((x) => x.category === c)
                .map((x) => (
                  <CodeRow key={x.id} code={x} />
                ))}
            </tbody>
          </table>
        ))}
      </div>
    </div>
  );
}
