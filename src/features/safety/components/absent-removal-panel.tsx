import { useState, type ReactNode } from 'react';
import { Button } from '../../../components/ui/button';
import { SelectField, TextField } from '../../../components/ui/field';
import { Panel } from '../../../components/ui/notice';
import { can, type Role } from '../../../../shared/permissions';
import { ABSENT_STEP_LABELS, type AbsentRemovalRow } from '../../../../shared/schemas/safety-absent-removal';
import type { LockoutDetail } from '../../../../shared/schemas/safety-lockout';
import type { SignMeaning } from '../../../../shared/schemas/safety-sign-offs';
import { useAbsentRemovals } from '../api/get-absent-removals';
import { useStartAbsentRemoval } from '../api/start-absent-removal';
import { useSignAbsentStep } from '../api/sign-absent-step';
import { useShopFormat } from '../../../lib/format';

type Me = { id: string; name: string; role: Role };
type Run = (meaning: SignMeaning, fn: (password: string) => Promise<unknown>, text: string, detail?: ReactNode) => void;

const MEANING: Record<string, SignMeaning> = {
  'contact-attempted': 'contact-attempted',
  'removal-authorized': 'removal-authorized',
  'locks-removed': 'absent-locks-removed',
  'employee-informed': 'employee-informed',
};

/** Who holds locks on this lockout, other than me: the people whose locks this procedure may remove. */
function holders(l: LockoutDetail, me: Me) {
  const map = new Map<string, string>();
  for (const p of l.points) if (!p.removedAt && p.holderId !== me.id) map.set(p.holderId, p.holderName);
  for (const m of l.members) if (!m.leftAt && m.userId !== me.id) map.set(m.userId, m.name);
  return [...map.entries()].map(([value, label]) => ({ value, label }));
}

function Steps({ r }: { r: AbsentRemovalRow }) {
  const f = useShopFormat();
  return (
    <ol className="space-y-1">
      {r.steps.map((s) => (
        <li key={s.step} className="rounded border border-safe bg-safe-soft px-3 py-2">
          <strong>{ABSENT_STEP_LABELS[s.step].title}</strong> ({ABSENT_STEP_LABELS[s.step].source}) · signed by {s.signerName} · {f.dateTime(s.at)}
          {s.note ? <span className="block text-sm text-steel-700">{s.note}</span> : null}
        </li>
      ))}
      {r.nextStep ? (
        <li className="rounded border border-dashed border-steel-400 px-3 py-2 text-steel-700">
          Next: <strong>{ABSENT_STEP_LABELS[r.nextStep].title}</strong> ({ABSENT_STEP_LABELS[r.nextStep].source}) —{' '}
          {ABSENT_STEP_LABELS[r.nextStep].who === 'safety' ? 'the safety officer signs' : `${r.supervisorName} signs`}
        </li>
      ) : null}
    </ol>
  );
}

/**
 * Removing the locks of an employee who is away (OSHA 29 CFR 1910.147(e)(3)): every step is
 * signed on its own and in order; the lock comes off only after the safety officer authorizes it.
 */
export function AbsentRemovalPanel({ lockout: l, me, run }: { lockout: LockoutDetail; me: Me; run: Run }) {
  const removals = useAbsentRemovals(l.id);
  const start = useStartAbsentRemoval();
  const step = useSignAbsentStep();
  const [absent, setAbsent] = useState('');
  const [startNote, setStartNote] = useState('');
  const [notOnSite, setNotOnSite] = useState(false);
  const [stepNote, setStepNote] = useState('');
  const allowed = can(me.role, 'safety.lockout.absent-removal');
  const rows = removals.data ?? [];
  const options = holders(l, me);
  const underWay = new Set(rows.filter((r) => r.nextStep).map((r) => r.absentUserId));
  const canStart = allowed && l.state !== 'released' && options.some((o) => !underWay.has(o.value));
  if (!rows.length && !canStart) return null;

  return (
    <Panel title="Absent employee’s locks (1910.147(e)(3))">
      <p className="mb-3 text-steel-800">
        Only when the person who applied a lock is not at the facility: verify they are away, try to reach them, get the safety officer’s authorization, remove
        the locks, and tell them before they resume work. Each step is signed.
      </p>
      {rows.map((r) => (
        <section key={r.id} aria-label={`Removal of ${r.absentName}'s locks`} className="mb-4 space-y-2">
          <h3 className="font-bold">
            {r.absentName}: locks {r.locks.map((x) => x.lock).join(', ')}
          </h3>
          <Steps r={r} />
          {r.nextStep && allowed ? (
            <div className="flex flex-wrap items-end gap-3">
              <TextField
                label={`What was done: ${ABSENT_STEP_LABELS[r.nextStep].title.toLowerCase()}`}
                value={stepNote}
                onChange={(e) => setStepNote(e.target.value)}
                autoComplete="off"
                className="min-w-[20rem]"
              />
              <Button
                disabled={stepNote.trim().length < 5}
                onClick={() =>
                  run(
                    MEANING[r.nextStep!],
                    async (password) => {
                      await step.mutateAsync({ id: r.id, body: { step: r.nextStep as never, note: stepNote.trim(), password } });
                      setStepNote('');
                    },
                    `${ABSENT_STEP_LABELS[r.nextStep!].title}: signed.`,
                  )
                }
              >
                Sign: {ABSENT_STEP_LABELS[r.nextStep].title.toLowerCase()}
              </Button>
            </div>
          ) : null}
        </section>
      ))}
      {canStart ? (
        <div className="space-y-2 border-t border-steel-200 pt-3">
          <SelectField
            label="Whose locks"
            value={absent}
            onChange={(e) => setAbsent(e.target.value)}
            options={[{ value: '', label: 'Choose the absent employee' }, ...options.filter((o) => !underWay.has(o.value))]}
          />
          <TextField label="How you checked they are not at the facility" value={startNote} onChange={(e) => setStartNote(e.target.value)} autoComplete="off" />
          <label className="flex min-h-touch items-center gap-3">
            <input type="checkbox" className="h-6 w-6" checked={notOnSite} onChange={(e) => setNotOnSite(e.target.checked)} />
            <span className="font-semibold">The employee is not at the facility</span>
          </label>
          <Button
            variant="secondary"
            disabled={!absent || !notOnSite || startNote.trim().length < 5}
            onClick={() =>
              run(
                'absence-verified',
                async (password) => {
                  await start.mutateAsync({ lockoutId: l.id, body: { absentUserId: absent, note: startNote.trim(), notOnSite: true, password } });
                  setAbsent('');
                  setStartNote('');
                  setNotOnSite(false);
                },
                'Absence verified and signed. Next: try to contact the employee.',
              )
            }
          >
            Sign: employee not at the facility
          </Button>
        </div>
      ) : null}
    </Panel>
  );
}
