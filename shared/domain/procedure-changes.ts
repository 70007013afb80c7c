/**
 * What a draft procedure version changes against the version in force, so the person approving
 * it sees the changes marked instead of rereading both texts (the review step of an energy-control
 * procedure; OSHA 29 CFR 1910.147(c)(4) asks for documented procedures, the review practice is
 * common practice). Lists are compared as sets of lines: a reworded step shows as one line removed
 * and one added; sources and minor tasks are matched by their tag or key.
 */
import { diffArrays } from 'diff';
import { ENERGY_KIND_LABELS, PHASE_LABELS, PROCEDURE_PHASES, type EnergySource, type ProcedureContent } from '../schemas/safety-procedures';

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

/** One line of the side-by-side view: the version in force on the left, the draft on the right. */
export type ComparedRow = { mark: 'same' | 'removed' | 'added' | 'changed'; before: string | null; after: string | null };
export type ComparedSection = { title: string; rows: ComparedRow[] };

/**
 * Aligns two lists line by line on their longest common subsequence (jsdiff's array diff), so
 * unchanged lines sit level with each other; a run of removed lines followed by a run of added
 * ones is paired up as changed lines, the rest stay removed or added.
 */
export function alignLines(before: string[], after: string[]): ComparedRow[] {
  const rows: ComparedRow[] = [];
  const chunks = diffArrays(before, after);
  for (let i = 0; i < chunks.length; i++) {
    const c = chunks[i];
    if (!c.added && !c.removed) {
      for (const line of c.value) rows.push({ mark: 'same', before: line, after: line });
      continue;
    }
    const next = chunks[i + 1];
    if (c.removed && next?.added) {
      const n = Math.max(c.value.length, next.value.length);
      for (let j = 0; j < n; j++) {
        const was = c.value[j] ?? null;
        const now = next.value[j] ?? null;
        rows.push({ mark: was === null ? 'added' : now === null ? 'removed' : 'changed', before: was, after: now });
      }
      i++;
      continue;
    }
    for (const line of c.value) rows.push(c.added ? { mark: 'added', before: null, after: line } : { mark: 'removed', before: line, after: null });
  }
  return rows;
}

function fieldRows(before: string[] | null, after: string[] | null): ComparedRow[] {
  if (!before) return (after ?? []).map((line) => ({ mark: 'added', before: null, after: line }));
  if (!after) return before.map((line) => ({ mark: 'removed', before: line, after: null }));
  // Fields are compared in place (same position, same label), not aligned as free text.
  return before.map((line, i) => ({ mark: line === after[i] ? 'same' : 'changed', before: line, after: after[i] }));
}

const sourceLines = (s: EnergySource) =>
  SOURCE_FIELDS.map(([field, label]) => `${label[0].toUpperCase()}${label.slice(1)}: ${field === 'kind' ? ENERGY_KIND_LABELS[s.kind] : String(s[field])}`);

/**
 * The version in force and the draft, section by section and line by line, with each line marked
 * same, removed, added or changed: the basis of the side-by-side approval view.
 */
export function procedureComparison(current: ProcedureContent, draft: ProcedureContent): ComparedSection[] {
  const out: ComparedSection[] = [{ title: 'Title and scope', rows: fieldRows([current.title, current.scope], [draft.title, draft.scope]) }];
  const oldSources = new Map(current.sources.map((s) => [s.key, s]));
  const newSources = new Map(draft.sources.map((s) => [s.key, s]));
  const keys = [...oldSources.keys(), ...[...newSources.keys()].filter((k) => !oldSources.has(k))];
  for (const key of keys) {
    const was = oldSources.get(key);
    const now = newSources.get(key);
    out.push({ title: `Energy source ${key}`, rows: fieldRows(was ? sourceLines(was) : null, now ? sourceLines(now) : null) });
  }
  for (const phase of PROCEDURE_PHASES) out.push({ title: PHASE_LABELS[phase].title, rows: alignLines(current.steps[phase], draft.steps[phase]) });
  out.push({ title: 'Release from lockout', rows: alignLines(current.release, draft.release) });
  const oldTasks = new Map((current.minorTasks ?? []).map((t) => [t.key, t]));
  const newTasks = new Map((draft.minorTasks ?? []).map((t) => [t.key, t]));
  const taskKeys = [...oldTasks.keys(), ...[...newTasks.keys()].filter((k) => !oldTasks.has(k))];
  for (const key of taskKeys) {
    const was = oldTasks.get(key);
    const now = newTasks.get(key);
    const name = (now ?? was)!.name;
    const rows =
      was && now
        ? [...fieldRows([was.name], [now.name]), ...alignLines(was.alternativeMeasures, now.alternativeMeasures)]
        : fieldRows(was ? [was.name, ...was.alternativeMeasures] : null, now ? [now.name, ...now.alternativeMeasures] : null);
    out.push({ title: `Minor servicing “${name}”`, rows });
  }
  return out;
}
