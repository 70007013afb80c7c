import { Link } from 'react-router-dom';
import { Panel, Notice } from '../../../components/ui/notice';
import { WorkCaution } from '../../../components/ui/caution';
import { ROLE_LABELS } from '../../../../shared/permissions';
import type { WorkOrderDetail } from '../../../../shared/schemas/work-orders';
import { paths } from '../../../config/paths';
import { DueBadge, KindBadge, LockoutBadge, SafetyWorkBadge, StateBadge } from '../../../components/ui/work-badges';
import { useShopFormat } from '../../../lib/format';

/** What the work is, where, when, and what must be in place before anyone starts. */
export function WorkOrderSummary({ wo }: { wo: WorkOrderDetail }) {
  const f = useShopFormat();
  const open = wo.status !== 'done' && wo.status !== 'cancelled';
  return (
    <div className="grid gap-4 lg:grid-cols-[2fr_1fr]">
      <Panel title="The work">
        <div className="space-y-3">
          <div className="flex flex-wrap items-center gap-2">
            <StateBadge status={wo.status} />
            <DueBadge state={wo.dueState} />
            {wo.requiresLockout ? <LockoutBadge /> : null}
            {wo.safetyCritical ? <SafetyWorkBadge /> : null}
            <KindBadge kind={wo.kind} />
          </div>
          <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
            <dt className="font-semibold">Machine</dt>
            <dd>
              <Link className="inline-flex min-h-touch items-center underline" to={paths.machine.getHref(wo.machine.id)}>
                {wo.machine.code} · {wo.machine.name}
              </Link>
            </dd>
            <dt className="font-semibold">Due</dt>
            <dd>
              {f.dateTime(wo.dueAt)} {wo.dueAt && open ? <span className="text-steel-600">({f.relative(wo.dueAt)})</span> : null}
            </dd>
            <dt className="font-semibold">For</dt>
            <dd>{wo.assignee?.name ?? (wo.responsibleRole ? `Any ${ROLE_LABELS[wo.responsibleRole].toLowerCase()}` : '—')}</dd>
            {wo.plan ? (
              <>
                <dt className="font-semibold">Plan</dt>
                <dd>
                  <Link className="inline-flex min-h-touch items-center underline" to={`/plans/${wo.plan.id}`}>
                    {wo.plan.title}
                  </Link>
                </dd>
              </>
            ) : null}
            {wo.estimatedMinutes ? (
              <>
                <dt className="font-semibold">Planned time</dt>
                <dd>{wo.estimatedMinutes} min</dd>
              </>
            ) : null}
            <dt className="font-semibold">Raised</dt>
            <dd>
              {f.dateTime(wo.raisedAt)}
              {wo.raisedBy ? ` by ${wo.raisedBy.name}` : ' by the schedule'}
            </dd>
          </dl>
          {wo.reason ? (
            <p className="text-sm text-steel-700">
              <span className="font-semibold">Why:</span> {wo.reason}
            </p>
          ) : null}
          {wo.instructions ? <div className="whitespace-pre-line rounded bg-steel-50 p-3">{wo.instructions}</div> : null}
          {wo.status === 'on-hold' && wo.holdReason ? (
            <Notice tone="caution" title="Paused">
              {wo.holdReason}
            </Notice>
          ) : null}
          {wo.status === 'cancelled' ? (
            <Notice tone="info" title="Called off">
              {wo.cancelReason}
            </Notice>
          ) : null}
          {wo.status === 'done' ? (
            // Focus lands here once the work is signed off (the sign-off panel goes away).
            <div id="work-signed-off" tabIndex={-1}>
              <Notice tone="safe" title={wo.stationRecord ? 'Done at the station' : 'Signed off'} role="status">
                {wo.stationRecord ? (
                  <>
                    {wo.completedBy?.name} recorded it at the station on {f.dateTime(wo.completedAt)}: <strong>{wo.stationRecord.summary}</strong>. That record
                    did this work; the checklist was not answered separately.
                  </>
                ) : (
                  <>
                    {wo.completedBy?.name} signed this off on {f.dateTime(wo.completedAt)}.
                  </>
                )}
                {wo.plan?.nextDueAt ? ` The plan is next due ${f.dateTime(wo.plan.nextDueAt)}.` : ''}
              </Notice>
            </div>
          ) : null}
        </div>
      </Panel>
      <div className="space-y-4">
        {open ? <WorkCaution /> : null}
        {wo.requiresLockout ? (
          <Panel title="Lockout/tagout">
            {wo.lockoutReleasedAt ? (
              <Notice tone="safe" title="Released">
                The lockout for this work was released on {f.dateTime(wo.lockoutReleasedAt)}.
              </Notice>
            ) : wo.lockoutSessionId ? (
              <Notice tone="mandatory" title="Lockout applied">
                Work under the lockout. Release it in the safety log before signing off.{' '}
                <Link className="font-semibold underline" to={paths.safetyLockout.getHref(wo.lockoutSessionId)}>
                  Open the lockout
                </Link>
              </Notice>
            ) : (
              <Notice tone="mandatory" title="Apply lockout before work">
                This work needs the machine isolated under the site’s energy-control procedure.{' '}
                {open ? (
                  <Link
                    className="mt-3 flex min-h-touch items-center justify-center rounded bg-steel-800 px-4 py-2 font-semibold text-white hover:bg-steel-700"
                    to={paths.safetyLockoutNew.getHref({ machineId: wo.machine.id, workOrderId: wo.id })}
                  >
                    Start a lockout for this work
                  </Link>
                ) : null}
              </Notice>
            )}
          </Panel>
        ) : null}
      </div>
    </div>
  );
}
