import { useState, type ReactNode } from 'react';
import { Button } from '../../../components/ui/button';
import { TextField } from '../../../components/ui/field';
import { Panel } from '../../../components/ui/notice';
import { WorkCaution } from '../../../components/ui/caution';
import { can, type Role } from '../../../../shared/permissions';
import type { LockoutDetail } from '../../../../shared/schemas/safety-lockout';
import type { SignMeaning } from '../../../../shared/schemas/safety-sign-offs';
import { OUTSIDE_STEP_LABELS, type OutsidePartyRow } from '../../../../shared/schemas/safety-outside-personnel';
import { useOutsideParties } from '../api/get-outside-parties';
import { useRegisterOutsideParty } from '../api/register-outside-party';
import { useSignOutsideStep } from '../api/sign-outside-step';
import { useShopFormat } from '../../../lib/format';

type Me = { id: string; name: string; role: Role };
type Run = (meaning: SignMeaning, fn: (password: string) => Promise<unknown>, text: string, detail?: ReactNode) => void;

function Tick({ label, checked, onChange }: { label: string; checked: boolean; onChange: (v: boolean) => void }) {
  return (
    <label className={`flex min-h-touch items-center gap-3 rounded border px-3 py-2 ${checked ? 'border-safe bg-safe-soft' : 'border-steel-300 bg-white'}`}>
      <input type="checkbox" className="h-6 w-6 shrink-0" checked={checked} onChange={(e) => onChange(e.target.checked)} />
      <span className="font-semibold">{label}</span>
    </label>
  );
}

/** One outside crew: who they are, what is signed, and the next steps for an authorized employee on site. */
function PartySection({ party: p, open, allowed, run }: { party: OutsidePartyRow; open: boolean; allowed: boolean; run: Run }) {
  const f = useShopFormat();
  const step = useSignOutsideStep();
  const [leadNameTyped, setLeadNameTyped] = useState('');
  const [acknowledgement, setAcknowledgement] = useState('');
  const [restrictions, setRestrictions] = useState('');
  const [informedWho, setInformedWho] = useState('');
  const [removed, setRemoved] = useState({ byLead: false, clear: false });
  const todo = new Set(p.open);
  const acted = open && allowed;
  return (
    <section aria-label={`Outside personnel: ${p.company}`} className="space-y-3 rounded border border-steel-300 p-3">
      <h3 className="text-lg font-bold">
        {p.company} {p.locksOn ? <span className="ml-2 rounded bg-danger px-2 py-0.5 text-sm text-white">Their locks are on</span> : null}
      </h3>
      <dl className="grid gap-x-4 gap-y-1 text-sm md:grid-cols-[12rem_1fr]">
        <dt className="font-semibold">Lead</dt>
        <dd>
          {p.leadName} · {p.leadContact}
        </dd>
        <dt className="font-semibold">Their procedure</dt>
        <dd>
          {p.procedureTitle} ({p.procedureVersion})
        </dd>
        <dt className="font-semibold">Their locks</dt>
        <dd>{p.lockNumbers.join(', ')}</dd>
        {p.acknowledgement ? (
          <>
            <dt className="font-semibold">Acknowledgement</dt>
            <dd>“{p.acknowledgement}”</dd>
          </>
        ) : null}
        {p.restrictions ? (
          <>
            <dt className="font-semibold">Their restrictions</dt>
            <dd>
              {p.restrictions} — told to {p.informedWho}
            </dd>
          </>
        ) : null}
      </dl>
      <ol className="space-y-1">
        {p.steps.map((s) => (
          <li key={s.step} className="rounded border border-safe bg-safe-soft px-3 py-2">
            <strong>{OUTSIDE_STEP_LABELS[s.step].title}</strong> ({OUTSIDE_STEP_LABELS[s.step].source}) · signed by {s.signerName} · {f.dateTime(s.at)}
          </li>
        ))}
      </ol>
      {acted && todo.has('lead-acknowledged') ? (
        <div className="grid gap-3 md:grid-cols-[1fr_2fr_auto] md:items-end">
          <TextField label="Lead’s name, as they give it" value={leadNameTyped} onChange={(e) => setLeadNameTyped(e.target.value)} autoComplete="off" />
          <TextField
            label="What the lead said (their acknowledgement)"
            value={acknowledgement}
            onChange={(e) => setAcknowledgement(e.target.value)}
            autoComplete="off"
          />
          <Button
            disabled={!leadNameTyped.trim() || acknowledgement.trim().length < 10}
            onClick={() =>
              run(
                'outside-procedure-acknowledged',
                (password) =>
                  step.mutateAsync({
                    id: p.id,
                    call: { action: 'acknowledge', body: { leadNameTyped: leadNameTyped.trim(), acknowledgement: acknowledgement.trim(), password } },
                  }),
                `${p.leadName}'s acknowledgement signed as witnessed.`,
                <p>
                  {leadNameTyped}: “{acknowledgement}”
                </p>,
              )
            }
          >
            Sign as witness: lead acknowledged
          </Button>
        </div>
      ) : null}
      {acted && todo.has('restrictions-informed') ? (
        <div className="grid gap-3 md:grid-cols-[2fr_1fr_auto] md:items-end">
          <TextField
            label="Their restrictions our people must keep"
            value={restrictions}
            onChange={(e) => setRestrictions(e.target.value)}
            autoComplete="off"
          />
          <TextField label="Affected employees you told" value={informedWho} onChange={(e) => setInformedWho(e.target.value)} autoComplete="off" />
          <Button
            disabled={restrictions.trim().length < 5 || informedWho.trim().length < 3}
            onClick={() =>
              run(
                'outside-restrictions-informed',
                (password) =>
                  step.mutateAsync({
                    id: p.id,
                    call: { action: 'inform', body: { restrictions: restrictions.trim(), informedWho: informedWho.trim(), password } },
                  }),
                'Our affected employees are told of the outside restrictions: signed.',
              )
            }
          >
            Sign: our employees told
          </Button>
        </div>
      ) : null}
      {acted && todo.has('locks-applied') ? (
        <div className="flex flex-wrap items-center gap-3">
          <Button
            variant="danger"
            disabled={todo.has('lead-acknowledged') || todo.has('restrictions-informed')}
            onClick={() =>
              run(
                'outside-locks-applied',
                (password) => step.mutateAsync({ id: p.id, call: { action: 'locks-on', body: { password } } }),
                `${p.company}'s locks are on: signed.`,
                <p>Locks {p.lockNumbers.join(', ')}</p>,
              )
            }
          >
            Sign: their locks are on
          </Button>
          {todo.has('lead-acknowledged') || todo.has('restrictions-informed') ? (
            <span className="text-sm text-steel-700">Their locks go on after their lead has acknowledged our procedure and our people are told.</span>
          ) : null}
        </div>
      ) : null}
      {acted && p.locksOn ? (
        <div className="grid gap-3 md:grid-cols-[1fr_1fr_auto] md:items-center">
          <Tick label={`${p.leadName} removed their own locks`} checked={removed.byLead} onChange={(v) => setRemoved({ ...removed, byLead: v })} />
          <Tick label={`${p.company}'s people are clear`} checked={removed.clear} onChange={(v) => setRemoved({ ...removed, clear: v })} />
          <Button
            variant="secondary"
            disabled={!removed.byLead || !removed.clear}
            onClick={() =>
              run(
                'outside-locks-removed',
                (password) => step.mutateAsync({ id: p.id, call: { action: 'locks-off', body: { removedByTheirLead: true, peopleClear: true, password } } }),
                `${p.company}'s locks are off: signed.`,
              )
            }
          >
            Sign: their locks are off
          </Button>
        </div>
      ) : null}
    </section>
  );
}

const EMPTY = { company: '', leadName: '', leadContact: '', procedureTitle: '', procedureVersion: '', locks: '' };

/**
 * Outside personnel (contractors) working under this lockout, OSHA 29 CFR 1910.147(f)(2): procedures
 * exchanged both ways, their lead's acknowledgement witnessed, our affected employees told of their
 * restrictions, and their own locks on and off — each signed by an authorized employee on site.
 */
export function OutsidePersonnelPanel({ lockout: l, me, run }: { lockout: LockoutDetail; me: Me; run: Run }) {
  const parties = useOutsideParties(l.id);
  const register = useRegisterOutsideParty();
  const [form, setForm] = useState(EMPTY);
  const [ticks, setTicks] = useState({ reviewed: false, given: false });
  const allowed = can(me.role, 'safety.lockout.sign');
  const open = l.state !== 'released';
  const rows = parties.data ?? [];
  const locks = form.locks
    .split(/[,\s]+/)
    .map((x) => x.trim())
    .filter(Boolean);
  const ready =
    form.company.trim().length >= 2 &&
    form.leadName.trim().length >= 2 &&
    form.leadContact.trim().length >= 5 &&
    form.procedureTitle.trim().length >= 3 &&
    form.procedureVersion.trim() &&
    locks.length > 0 &&
    ticks.reviewed &&
    ticks.given;
  const field = (key: keyof typeof EMPTY, label: string, hint?: string) => (
    <TextField label={label} hint={hint} value={form[key]} onChange={(e) => setForm({ ...form, [key]: e.target.value })} autoComplete="off" />
  );

  return (
    <Panel title="Outside personnel (1910.147(f)(2))">
      <p className="mb-3 text-steel-800">
        When another company’s people service this machine, both sides exchange energy-control procedures, their lead acknowledges ours, and our affected
        employees are told of their restrictions. Their locks go on and off here; the lockout cannot be released while they are on.
      </p>
      {rows.length === 0 ? <p className="mb-3 text-steel-700">No outside personnel on this lockout.</p> : null}
      <div className="space-y-3">
        {rows.map((p) => (
          <PartySection key={p.id} party={p} open={open} allowed={allowed} run={run} />
        ))}
      </div>
      {open && allowed ? (
        <form
          aria-label="Add outside personnel"
          className="mt-4 space-y-3 border-t border-steel-200 pt-3"
          onSubmit={(e) => {
            e.preventDefault();
            if (!ready) return;
            run(
              'outside-procedures-exchanged',
              async (password) => {
                await register.mutateAsync({
                  lockoutId: l.id,
                  body: {
                    company: form.company.trim(),
                    leadName: form.leadName.trim(),
                    leadContact: form.leadContact.trim(),
                    procedureTitle: form.procedureTitle.trim(),
                    procedureVersion: form.procedureVersion.trim(),
                    lockNumbers: locks,
                    theirProcedureReviewed: true,
                    ourProcedureGiven: true,
                    password,
                  },
                });
                setForm(EMPTY);
                setTicks({ reviewed: false, given: false });
              },
              'Outside personnel added; procedures exchanged and signed. Next: their lead acknowledges our procedure.',
              <p>
                {form.company}: {form.procedureTitle} ({form.procedureVersion}); locks {locks.join(', ')}
              </p>,
            );
          }}
        >
          <h3 className="font-bold">Add outside personnel</h3>
          <WorkCaution />
          <div className="grid gap-3 md:grid-cols-2">
            {field('company', 'Outside company')}
            {field('leadName', 'Their lead’s name')}
            {field('leadContact', 'Lead’s phone or e-mail')}
            {field('locks', 'Their personal lock numbers', 'Separate with commas or spaces.')}
            {field('procedureTitle', 'Their procedure’s title')}
            {field('procedureVersion', 'Their procedure’s version')}
          </div>
          <div className="grid gap-3 md:grid-cols-2">
            <Tick
              label="I received and reviewed their energy-control procedure"
              checked={ticks.reviewed}
              onChange={(v) => setTicks({ ...ticks, reviewed: v })}
            />
            <Tick label="I gave them our procedure for this machine" checked={ticks.given} onChange={(v) => setTicks({ ...ticks, given: v })} />
          </div>
          <Button type="submit" disabled={!ready}>
            Sign: procedures exchanged
          </Button>
        </form>
      ) : null}
    </Panel>
  );
}
