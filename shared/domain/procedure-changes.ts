/**
 * What a draft procedure version changes against the version in force, so the person approving
 * it sees the changes marked instead of rereading both texts (the review step of an energy-control
 * procedure; OSHA 29 CFR 1910.147(c)(4) asks for documented procedures, the review practice is
 * common practice). Lists are compared as sets of lines: a reworded step shows as one line removed
 * and one added; sources and minor tasks are matched by their tag or key.
 */
import { PHASE_LABELS, PROCEDURE_PHASES, type EnergySource, type ProcedureContent } from '../schemas/safety-procedures';

export type ProcedureChange = { section: string; kind: 'added' | 'removed' | 'changed'; before?: string; after?: string };

const SOURCE_FIELDS: [keyof EnergySource, string][] = [
  ['kind', 'kind'],
  ['description', 'description'],
  ['magnitude', 'magnitude'],
  ['isolationDevice', 'isolation device'],
  ['location', 'location'],
  ['relieveMethod', 'relieving'],
  ['verifyMethod', 'verifying'],
];

function lines(section: string, before: string[], after: string[]): ProcedureChange[] {
  const had = new Set(before);
  const has = new Set(after);
  return [
    ...before.filter((l) => !has.has(l)).map((l): ProcedureChange => ({ section, kind: 'removed', before: l })),
    ...after.filter((l) => !had.has(l)).map((l): ProcedureChange => ({ section, kind: 'added', after: l })),
  ];
}

export function procedureChanges(current: ProcedureContent, draft: ProcedureContent): ProcedureChange[] {
  const out: ProcedureChange[] = [];
  if (current.title !== draft.title) out.push({ section: 'Title', kind: 'changed', before: current.title, after: draft.title });
  if (current.scope !== draft.scope) out.push({ section: 'Scope', kind: 'changed', before: current.scope, after: draft.scope });

  const oldSources = new Map(current.sources.map((s) => [s.key, s]));
  const newSources = new Map(draft.sources.map((s) => [s.key, s]));
  for (const [key, s] of oldSources) if (!newSources.has(key)) out.push({ section: `Energy source ${key}`, kind: 'removed', before: s.description });
  for (const [key, s] of newSources) {
    const was = oldSources.get(key);
    if (!was) out.push({ section: `Energy source ${key}`, kind: 'added', after: s.description });
    else
      for (const [field, label] of SOURCE_FIELDS)
        if (was[field] !== s[field])
          out.push({ section: `Energy source ${key}, ${label}`, kind: 'changed', before: String(was[field]), after: String(s[field]) });
  }

  for (const phase of PROCEDURE_PHASES) out.push(...lines(PHASE_LABELS[phase].title, current.steps[phase], draft.steps[phase]));
  out.push(...lines('Release from lockout', current.release, draft.release));

  const oldTasks = new Map((current.minorTasks ?? []).map((t) => [t.key, t]));
  const newTasks = new Map((draft.minorTasks ?? []).map((t) => [t.key, t]));
  for (const [key, t] of oldTasks) if (!newTasks.has(key)) out.push({ section: 'Minor servicing', kind: 'removed', before: t.name });
  for (const [key, t] of newTasks) {
    const was = oldTasks.get(key);
    if (!was) out.push({ section: 'Minor servicing', kind: 'added', after: t.name });
    else {
      if (was.name !== t.name) out.push({ section: 'Minor servicing', kind: 'changed', before: was.name, after: t.name });
      out.push(...lines(`Minor servicing “${t.name}”, alternative measures`, was.alternativeMeasures, t.alternativeMeasures));
    }
  }
  return out;
}
