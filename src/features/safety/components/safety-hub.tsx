import { Link } from 'react-router-dom';
import { createColumnHelper } from '@tanstack/react-table';
import { DataTable } from '../../../components/ui/data-table';
import { Badge, EmptyState, Notice, Panel } from '../../../components/ui/notice';
import { WorkCaution } from '../../../components/ui/caution';
import { can, type Role } from '../../../../shared/permissions';
import { TASK_KIND_LABELS, type SafetyTaskRow } from '../../../../shared/schemas/safety-records';
import type { LockoutRow } from '../../../../shared/schemas/safety-lockout';
import { paths } from '../../../config/paths';
import { useSafetyTasks } from '../api/get-safety-tasks';
import { useLockouts } from '../api/get-lockouts';
import { useFireWatches } from '../api/get-fire-watches';
import { LockoutStateBadge } from './badges';
import { useShopFormat } from '../../../lib/format';

const taskCol = createColumnHelper<SafetyTaskRow>();
const lockCol = createColumnHelper<LockoutRow>();

/** Where a due task is done: the PPE check of its machine, the inspection form for its procedure, the person's training form. */
function taskHref(t: SafetyTaskRow): string {
  const records = paths.safetyRecords.getHref();
  if (t.kind === 'ppe-check') return paths.safetyPpe.getHref(t.machineId ?? undefined);
  if (t.kind === 'periodic-inspection') return `${records}?${new URLSearchParams(t.procedureId ? { inspect: t.procedureId } : {})}#record-inspection`;
  return `${records}?${new URLSearchParams({ ...(t.personId ? { train: t.personId } : {}), ...(t.procedureId ? { procedure: t.procedureId } : {}), ...(t.trainingKind ? { as: t.trainingKind } : {}) })}#record-training`;
}

const action = 'flex min-h-touch items-center justify-center rounded px-4 py-3 text-center text-base font-semibold';

/** The front page of the safety log: what to act on now, and the way to each record. */
export function SafetyHub({ role }: { role: Role }) {
  const f = useShopFormat();
  const tasks = useSafetyTasks();
  const open = useLockouts({ state: 'open', page: 1, pageSize: 50 });
  const watches = useFireWatches();
  const running = (watches.data ?? []).filter((w) => !w.endedAt);

  return (
    <div className="space-y-4">
      <nav aria-label="Safety actions" className="grid grid-cols-2 gap-3 md:grid-cols-4">
        {can(role, 'safety.ppe.sign') ? (
          <Link className={`${action} bg-mandatory text-white`} to={paths.safetyPpe.getHref()}>
            Do my PPE check
          </Link>
        ) : null}
        {can(role, 'safety.lockout.sign') ? (
          <Link className={`${action} bg-danger text-white`} to={paths.safetyLockoutNew.getHref()}>
            Lock out a machine
          </Link>
        ) : null}
        {can(role, 'safety.hotwork.sign') ? (
          <Link className={`${action} border border-steel-400 bg-white text-steel-900`} to={paths.safetyHotWork.getHref()}>
            Fire watch
          </Link>
        ) : null}
        <Link className={`${action} border border-steel-400 bg-white text-steel-900`} to={paths.safetyProcedures.getHref()}>
          Energy-control procedures
        </Link>
        <Link className={`${action} border border-steel-400 bg-white text-steel-900`} to={paths.safetyLockouts.getHref()}>
          All lockouts
        </Link>
        <Link className={`${action} border border-steel-400 bg-white text-steel-900`} to={paths.safetyLocks.getHref()}>
          Lock register
        </Link>
        <Link className={`${action} border border-steel-400 bg-white text-steel-900`} to={paths.safetyRecords.getHref()}>
          Inspections and training
        </Link>
        {can(role, 'safety.ppe.manage') ? (
          <Link className={`${action} border border-steel-400 bg-white text-steel-900`} to={paths.safetyPpeRequirements.getHref()}>
            PPE requirements
          </Link>
        ) : null}
        {can(role, 'safety.audit') ? (
          <Link className={`${action} border border-steel-400 bg-white text-steel-900`} to={paths.safetyAudit.getHref()}>
            Audit and exports
          </Link>
        ) : null}
        {can(role, 'safety.audit') ? (
          <Link className={`${action} border border-steel-400 bg-white text-steel-900`} to={paths.safetyEvents.getHref()}>
            Refusals and alarms
          </Link>
        ) : null}
        {can(role, 'safety.settings.manage') ? (
          <Link className={`${action} border border-steel-400 bg-white text-steel-900`} to={paths.safetySettings.getHref()}>
            Site safety settings
          </Link>
        ) : null}
      </nav>

      {running.length ? (
        <Notice tone="caution" title={`Fire watch running (${running.length})`} role="status">
          {running.map((w) => (
            <span key={w.id} className="block">
              {w.machineCode}: {w.watcherName} watches until {f.time(w.until)}.{' '}
              <Link className="font-semibold underline" to={paths.safetyHotWork.getHref()}>
                Open
              </Link>
            </span>
          ))}
        </Notice>
      ) : null}

      <div className="grid gap-4 lg:grid-cols-2">
        <Panel title="Machines locked out now">
          {open.isError ? <Notice tone="danger">{open.error.message}</Notice> : null}
          <DataTable
            caption="Open lockouts"
            data={open.data?.rows ?? []}
            loading={open.isLoading}
            getRowId={(r) => r.id}
            empty={<EmptyState title="No machine is locked out" />}
            columns={[
              lockCol.accessor('machineCode', {
                header: 'Machine',
                cell: (c) => (
                  <Link className="font-semibold underline" to={paths.safetyLockout.getHref(c.row.original.id)}>
                    {c.getValue()} · {c.row.original.machineName}
                  </Link>
                ),
              }),
              lockCol.accessor('state', { header: 'State', cell: (c) => <LockoutStateBadge state={c.getValue()} /> }),
              lockCol.accessor('primaryName', { header: 'Held by' }),
              lockCol.accessor('appliedAt', { header: 'Since', cell: (c) => f.dateTime(c.getValue()) }),
            ]}
          />
        </Panel>
        <Panel title="Safety work due">
          {tasks.isError ? <Notice tone="danger">{tasks.error.message}</Notice> : null}
          <DataTable
            caption="Safety work due"
            data={tasks.data ?? []}
            loading={tasks.isLoading}
            getRowId={(r) => r.id}
            empty={<EmptyState title="Nothing due">Inspections, PPE checks and retraining show here when they fall due.</EmptyState>}
            columns={[
              taskCol.accessor('status', {
                header: 'Status',
                cell: (c) => <Badge tone={c.getValue() === 'overdue' ? 'danger' : 'caution'}>{c.getValue() === 'overdue' ? 'Overdue' : 'Due'}</Badge>,
              }),
              taskCol.accessor('kind', { header: 'Kind', cell: (c) => TASK_KIND_LABELS[c.getValue() as SafetyTaskRow['kind']] }),
              taskCol.accessor('title', {
                header: 'What',
                cell: (c) => (
                  <Link className="inline-flex min-h-touch items-center font-semibold underline" to={taskHref(c.row.original)}>
                    {c.getValue()}
                  </Link>
                ),
              }),
              taskCol.accessor('dueAt', { header: 'Due', cell: (c) => f.dateTime(c.getValue()) }),
            ]}
          />
        </Panel>
      </div>
      <WorkCaution />
    </div>
  );
}
