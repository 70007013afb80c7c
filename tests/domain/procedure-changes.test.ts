import { describe, expect, it } from 'vitest';
import { alignLines, procedureChanges, procedureComparison } from '../../shared/domain/procedure-changes';
import { PHASE_LABELS, PROCEDURE_PHASES, type ProcedureContent } from '../../shared/schemas/safety-procedures';

// Hand-made versions: each expected change below is read off the two texts by eye.
const v1: ProcedureContent = {
  title: 'Press brake energy control',
  scope: 'Tool changes.',
  sources: [
    {
      key: 'B1-E1',
      kind: 'electrical',
      description: 'Main supply',
      magnitude: '400 V AC',
      isolationDevice: 'Main switch',
      location: 'Cabinet',
      relieveMethod: 'None',
      verifyMethod: 'Try start',
    },
    {
      key: 'B1-H1',
      kind: 'hydraulic',
      description: 'Ram cylinder',
      magnitude: '250 bar',
      isolationDevice: 'Valve V1',
      location: 'Rear',
      relieveMethod: 'Lower the ram onto blocks',
      verifyMethod: 'Gauge reads 0',
    },
  ],
  steps: {
    prepare: ['Tell the operator'],
    shutdown: ['Stop the cycle'],
    isolate: ['Main switch off'],
    apply: ['Lock the main switch'],
    relieve: ['Lower the ram onto blocks'],
    verify: ['Try start'],
  },
  release: ['Remove the lock'],
};

describe('procedure changes between the version in force and a draft', () => {
  it('finds nothing when the draft repeats the version in force', () => {
    expect(procedureChanges(v1, structuredClone(v1))).toEqual([]);
  });

  it('marks a changed scope, a changed source field, an added source, a reworded step and a new release line', () => {
    const draft: ProcedureContent = structuredClone(v1);
    draft.scope = 'Tool changes and back-gauge work.';
    draft.sources[1].magnitude = '280 bar';
    draft.sources.push({ ...v1.sources[0], key: 'B1-P1', kind: 'pneumatic', description: 'Clamp air', magnitude: '6 bar' });
    draft.steps.verify = ['Try start with both hands on the controls'];
    draft.release = ['Remove the lock', 'Tell the operator the brake is back'];
    expect(procedureChanges(v1, draft)).toEqual([
      { section: 'Scope', kind: 'changed', before: 'Tool changes.', after: 'Tool changes and back-gauge work.' },
      { section: 'Energy source B1-H1, magnitude', kind: 'changed', before: '250 bar', after: '280 bar' },
      { section: 'Energy source B1-P1', kind: 'added', after: 'Clamp air' },
      { section: 'Verify isolation', kind: 'removed', before: 'Try start' },
      { section: 'Verify isolation', kind: 'added', after: 'Try start with both hands on the controls' },
      { section: 'Release from lockout', kind: 'added', after: 'Tell the operator the brake is back' },
    ]);
  });

  it('marks a removed source and minor-servicing tasks added, renamed and with changed measures', () => {
    const withTask: ProcedureContent = {
      ...structuredClone(v1),
      minorTasks: [{ key: 'die-wipe', name: 'Wipe the dies', alternativeMeasures: ['Ram at bottom'] }],
    };
    const draft: ProcedureContent = structuredClone(withTask);
    draft.sources = [draft.sources[0]];
    draft.minorTasks = [
      { key: 'die-wipe', name: 'Wipe the dies clean', alternativeMeasures: ['Ram at bottom', 'Foot pedal covered'] },
      { key: 'gauge-check', name: 'Read the back-gauge', alternativeMeasures: ['Machine in setup mode'] },
    ];
    expect(procedureChanges(withTask, draft)).toEqual([
      { section: 'Energy source B1-H1', kind: 'removed', before: 'Ram cylinder' },
      { section: 'Minor servicing', kind: 'changed', before: 'Wipe the dies', after: 'Wipe the dies clean' },
      { section: 'Minor servicing “Wipe the dies clean”, alternative measures', kind: 'added', after: 'Foot pedal covered' },
      { section: 'Minor servicing', kind: 'added', after: 'Read the back-gauge' },
    ]);
  });
});

describe('side-by-side alignment of the version in force and a draft', () => {
  it('keeps the longest common subsequence level: Myers’ worked example ABCABBA → CBABAC', () => {
    // E. W. Myers, "An O(ND) Difference Algorithm and Its Variations", Algorithmica 1 (1986), fig. 1:
    // the LCS of ABCABBA and CBABAC has length 4 and the shortest edit script 5 steps (3 deletions, 2 insertions).
    const rows = alignLines([...'ABCABBA'], [...'CBABAC']);
    expect(rows.filter((r) => r.mark === 'same')).toHaveLength(4);
    // Every line of each side appears once, in its own order.
    expect(rows.flatMap((r) => (r.before === null ? [] : [r.before])).join('')).toBe('ABCABBA');
    expect(rows.flatMap((r) => (r.after === null ? [] : [r.after])).join('')).toBe('CBABAC');
    // Deletions and insertions together make the 5-step edit script (a changed row is one of each).
    const deletions = rows.filter((r) => r.before !== null && r.mark !== 'same').length;
    const insertions = rows.filter((r) => r.after !== null && r.mark !== 'same').length;
    expect([deletions, insertions]).toEqual([3, 2]);
  });

  it('pairs a reworded step as one changed row and leaves the steps around it level', () => {
    expect(alignLines(['Stop the cycle', 'Main switch off', 'Tell the operator'], ['Stop the cycle', 'Main switch off and lock', 'Tell the operator'])).toEqual(
      [
        { mark: 'same', before: 'Stop the cycle', after: 'Stop the cycle' },
        { mark: 'changed', before: 'Main switch off', after: 'Main switch off and lock' },
        { mark: 'same', before: 'Tell the operator', after: 'Tell the operator' },
      ],
    );
    expect(alignLines(['A'], ['A', 'B'])).toEqual([
      { mark: 'same', before: 'A', after: 'A' },
      { mark: 'added', before: null, after: 'B' },
    ]);
  });

  it('lays out every section of both versions, with a removed source on the left only and an added one on the right only', () => {
    const draft: ProcedureContent = structuredClone(v1);
    draft.sources = [draft.sources[0], { ...v1.sources[0], key: 'B1-P1', kind: 'pneumatic', description: 'Clamp air', magnitude: '6 bar' }];
    draft.scope = 'Tool changes and back-gauge work.';
    const sections = procedureComparison(v1, draft);
    expect(sections.map((s) => s.title)).toEqual([
      'Title and scope',
      'Energy source B1-E1',
      'Energy source B1-H1',
      'Energy source B1-P1',
      ...PROCEDURE_PHASES.map((phase) => PHASE_LABELS[phase].title),
      'Release from lockout',
    ]);
    expect(sections[0].rows.map((r) => r.mark)).toEqual(['same', 'changed']);
    expect(sections[1].rows.every((r) => r.mark === 'same')).toBe(true);
    expect(sections[2].rows.every((r) => r.mark === 'removed' && r.after === null)).toBe(true);
    expect(sections[3].rows.every((r) => r.mark === 'added' && r.before === null)).toBe(true);
    expect(sections[3].rows[0].after).toBe('Kind: Pneumatic supply');
  });
});
