import { useState, type ReactNode } from 'react';
import { procedureComparison, type ComparedRow } from '../../../../shared/domain/procedure-changes';
import type { ProcedureContent } from '../../../../shared/schemas/safety-procedures';

const MARKED = {
  before: { cell: 'bg-danger-soft', Tag: 'del', text: 'text-danger-ink', lead: 'Was: ' },
  after: { cell: 'bg-safe-soft', Tag: 'ins', text: 'text-safe-ink no-underline', lead: 'Now: ' },
} as const;

function Cell({ side, row }: { side: 'before' | 'after'; row: ComparedRow }) {
  const text = row[side];
  if (text === null) return <td className="border-t border-steel-200 bg-steel-50 p-2 align-top text-steel-500">—</td>;
  if (row.mark === 'same') return <td className="border-t border-steel-200 p-2 align-top">{text}</td>;
  const { cell, Tag, text: tone, lead } = MARKED[side];
  return (
    <td className={`border-t border-steel-200 p-2 align-top ${cell}`}>
      <Tag className={tone}>
        <span className="sr-only">{lead}</span>
        {text}
      </Tag>
    </td>
  );
}

/**
 * The version in force and the draft side by side, section by section, with each changed line
 * marked on both sides; the approve action (children) sits under the draft's column.
 */
export function ProcedureSideBySide({
  current,
  currentVersion,
  draft,
  draftVersion,
  children,
}: {
  current: ProcedureContent;
  currentVersion: number;
  draft: ProcedureContent;
  draftVersion: number;
  children?: ReactNode;
}) {
  const [onlyChanges, setOnlyChanges] = useState(false);
  const sections = procedureComparison(current, draft)
    .map((s) => ({ ...s, rows: onlyChanges ? s.rows.filter((r) => r.mark !== 'same') : s.rows }))
    .filter((s) => s.rows.length > 0);
  return (
    <section aria-labelledby="side-by-side" className="space-y-2">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h3 id="side-by-side" className="text-lg font-bold">
          Side by side
        </h3>
        <label className="flex min-h-touch items-center gap-2">
          <input type="checkbox" className="h-6 w-6" checked={onlyChanges} onChange={(e) => setOnlyChanges(e.target.checked)} />
          Only the changed lines
        </label>
      </div>
      {sections.length === 0 ? <p className="text-steel-700">No line differs from version {currentVersion}.</p> : null}
      <div className="overflow-x-auto rounded border border-steel-300 bg-white">
        <table className="w-full table-fixed border-collapse text-sm" aria-label={`Version ${currentVersion} beside draft version ${draftVersion}`}>
          <thead className="sticky top-0 bg-steel-100">
            <tr>
              <th scope="col" className="w-1/2 p-2 text-left">
                Version {currentVersion} — in force
              </th>
              <th scope="col" className="w-1/2 p-2 text-left">
                Draft version {draftVersion}
              </th>
            </tr>
          </thead>
          {sections.map((s) => (
            <tbody key={s.title}>
              <tr>
                <th colSpan={2} scope="colgroup" className="border-t-2 border-steel-300 bg-steel-50 p-2 text-left font-bold">
                  {s.title}
                </th>
              </tr>
              {s.rows.map((r, i) => (
                <tr key={i} data-mark={r.mark}>
                  <Cell side="before" row={r} />
                  <Cell side="after" row={r} />
                </tr>
              ))}
            </tbody>
          ))}
          {children ? (
            <tbody>
              <tr>
                <td className="border-t-2 border-steel-300 p-2 align-top text-steel-700">Stays in force until the draft is approved.</td>
                <td className="border-t-2 border-steel-300 p-2 align-top">{children}</td>
              </tr>
            </tbody>
          ) : null}
        </table>
      </div>
    </section>
  );
}
