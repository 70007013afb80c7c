import { Link } from 'react-router-dom';
import type { StationAlarm, StationDueRow, StationLockout } from '../../../../shared/schemas/consumables';
import { WORK_STATE_LABELS } from '../../../../shared/schemas/work-orders';
import { DueBadge, LockoutBadge } from '../../../components/ui/work-badges';
import { paths } from '../../../config/paths';
import { useShopFormat } from '../../../lib/format';

/** First thing on the station page: an applied lockout means the machine must not be run. */
export function LockoutBanner({ lockouts }: { lockouts: StationLockout[] }) {
  const f = useShopFormat();
  if (lockouts.length === 0) return null;
  return (
    <div role="alert" className="rounded border-4 border-danger bg-danger px-4 py-3 text-white">
      <p className="text-2xl font-bold">Locked out — do not operate</p>
      <ul className="mt-1 space-y-1">
        {lockouts.map((l) => (
          <li key={l.id}>
            {l.sharedPoint ? (
              <>
                <strong>
                  Shared point {l.sharedPoint} on {l.machineCode} is locked
                </strong>{' '}
                (it feeds this machine) · {l.reason} · {l.heldBy}’s lock since {f.dateTime(l.appliedAt)}
              </>
            ) : (
              <>
                {l.machineCode} · {l.reason} · locked since {f.dateTime(l.appliedAt)} by {l.heldBy}
              </>
            )}
            {l.state === 'verified' ? ' · isolation verified' : ''}
            {l.state === 'testing' ? ' · energized for testing by the lock holder — stay clear' : ''}
          </li>
        ))}
      </ul>
    </div>
  );
}

/** A counter rose while the machine was locked out: the machine ran, or the procedure misses an energy source. */
export function LockoutAlarmBanner({ alarms }: { alarms: StationAlarm[] }) {
  const f = useShopFormat();
  if (alarms.length === 0) return null;
  return (
    <div role="alert" data-testid="lockout-alarm" className="rounded border-4 border-danger bg-white px-4 py-3 text-danger">
      <p className="text-xl font-bold">Alarm: counter rose while locked out</p>
      <ul className="mt-1 space-y-1 text-steel-900">
        {alarms.map((a) => (
          <li key={a.id}>
            {f.dateTime(a.at)} · {a.reason}
            {a.lockoutId ? (
              <>
                {' · '}
                <Link to={paths.safetyLockout.getHref(a.lockoutId)} className="font-semibold underline">
                  open the lockout
                </Link>
              </>
            ) : null}
          </li>
        ))}
      </ul>
    </div>
  );
}

/** Open work on the machine and its components, so the operator knows what is coming. */
export function DueList({ code, rows }: { code: string; rows: StationDueRow[] }) {
  const f = useShopFormat();
  return (
    <section aria-labelledby="due-heading" className="rounded border border-steel-200 bg-white p-4 shadow-sm">
      <h2 id="due-heading" className="mb-2 text-lg font-bold">
        Due on {code}
      </h2>
      {rows.length === 0 ? <p className="text-steel-700">No open work orders.</p> : null}
      <ul className="divide-y divide-steel-200">
        {rows.map((w) => (
          <li key={w.id}>
            <Link to={paths.workOrder.getHref(w.id)} className="flex min-h-touch flex-wrap items-center gap-x-3 gap-y-1 py-2 hover:bg-steel-50">
              <span className="font-semibold text-mandatory-ink underline">
                #{w.number} {w.title}
              </span>
              <span className="text-sm text-steel-700">
                {w.machineCode !== code ? `${w.machineCode} · ` : ''}
                {WORK_STATE_LABELS[w.status]}
              </span>
              <span className="ml-auto inline-flex items-center gap-2 text-sm tabular-nums">
                {/* Same badges as the work lists, so "lockout required" reads the same at the machine. */}
                {w.requiresLockout ? <LockoutBadge /> : null}
                {w.dueAt ? `due ${f.date(w.dueAt)}` : 'no due date'}
                {w.overdue ? <DueBadge state="overdue" /> : null}
              </span>
            </Link>
          </li>
        ))}
      </ul>
    </section>
  );
}
