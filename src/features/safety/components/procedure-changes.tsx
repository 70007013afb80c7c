import { procedureChanges } from '../../../../shared/domain/procedure-changes';
import type { ProcedureContent } from '../../../../shared/schemas/safety-procedures';

/** The draft's changes against the version in force, marked, so approval reads the difference. */
export function ProcedureChanges({ current, currentVersion, draft }: { current: ProcedureContent; currentVersion: number; draft: ProcedureContent }) {
  const changes = procedureChanges(current, draft);
  return (
    <section aria-labelledby="draft-changes" className="mb-4 space-y-2">
      <h3 id="draft-changes" className="text-lg font-bold">
        What changes from version {currentVersion}
      </h3>
      {changes.length === 0 ? (
        <p className="text-steel-700">The draft’s text is the same as version {currentVersion}.</p>
      ) : (
        <ul className="space-y-2" aria-label={`Changes from version ${currentVersion}`}>
          {changes.map((c, i) => (
            <li key={i} className="rounded border border-steel-300 bg-white p-2">
              <p className="text-sm font-semibold text-steel-700">
                {c.section} · {c.kind === 'added' ? 'added' : c.kind === 'removed' ? 'removed' : 'changed'}
              </p>
              {c.before !== undefined ? (
                <del className="block bg-danger-soft px-1 text-danger-ink">
                  <span className="sr-only">Was: </span>
                  {c.before}
                </del>
              ) : null}
              {c.after !== undefined ? (
                <ins className="block bg-safe-soft px-1 text-safe-ink no-underline">
                  <span className="sr-only">Now: </span>
                  {c.after}
                </ins>
              ) : null}
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}
