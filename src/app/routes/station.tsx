import { Link, useLocation, useParams, type LoaderFunctionArgs } from 'react-router-dom';
import { Notice, Panel } from '../../components/ui/notice';
import { usePageTitle } from '../../components/layout/app-shell';
import { getStationQueryOptions, useStation } from '../../features/station/api/get-station';
import { TorchPanel } from '../../features/station/components/torch-panel';
import { RecentChanges } from '../../features/station/components/recent-changes';
import { ToolsSummary } from '../../features/station/components/tools-summary';
import { RecordCountersPanel } from '../../features/station/components/record-counters-panel';
import { PpeCheckLink, PpeSignedNotice } from '../../features/station/components/ppe-check-link';
import { DueList, LockoutAlarmBanner, LockoutBanner } from '../../features/station/components/station-status';
import { useMachineStatus } from '../../features/machine-state/api/get-status';
import { StateBanner } from '../../features/machine-state/components/state-banner';
import { FaultReport } from '../../features/machine-state/components/fault-report';
import { ReturnToServiceButton } from '../../features/machine-state/components/return-to-service';
import { CutCheckForm } from '../../features/cut-checks/components/cut-check-form';
import { CutChecksTable } from '../../features/cut-checks/components/cut-checks-table';
import { MetersTable } from '../../features/meters/components/meters-table';
import { useMe } from '../../features/auth/api/get-me';
import { queryClient } from '../../lib/query-client';
import { can } from '../../../shared/permissions';
import { paths } from '../../config/paths';
import { MACHINE_KIND_LABELS, type MachineKind } from '../../../shared/schemas/machines';
import { PRE_USE_LINES } from '../../../shared/domain/pre-use-checks';
import { useQuery } from '@tanstack/react-query';
import { getPreUseCheckQueryOptions } from '../../features/safety/api/get-pre-use-check';

// Only these carry a plasma torch; on a press brake or hydraulic unit a missing torch is normal, not a setup gap.
const CUTS_WITH_PLASMA: MachineKind[] = ['punch-plasma-cell', 'plasma-table'];

/** A notice another page hands the station when it sends the operator back (a signed pre-use check). */
export type StationNotice = { tone: 'safe' | 'caution' | 'danger'; title: string; text: string };

// Kinds with a pre-use check at the start of a shift (shared/domain/pre-use-checks.ts).
const PRE_USE_KINDS = new Set(Object.keys(PRE_USE_LINES));

export const loader = ({ params }: LoaderFunctionArgs) => queryClient.ensureQueryData(getStationQueryOptions(params.code!)).catch(() => null);

/** The operator's page at the machine, opened from the QR label. */
export function Component() {
  const { code } = useParams();
  const { data: me } = useMe();
  const q = useStation(code!);
  usePageTitle(`Station ${code}`);
  const status = useMachineStatus(code!);
  const notice = (useLocation().state as { notice?: StationNotice } | null)?.notice;
  const hasPreUse = !!q.data && PRE_USE_KINDS.has(q.data.machine.kind);
  const preUse = useQuery({ ...getPreUseCheckQueryOptions(code!), enabled: hasPreUse });
  if (!me) return null;
  if (q.isError)
    return (
      <div className="space-y-4">
        <Notice tone="danger" role="alert" title="Station not found">
          {q.error.message}. Check the code on the label, or pick the machine from the list.
        </Notice>
        {/* Those who log changes have the station buttons on Today; everyone else finds the machine in the machine list. */}
        {can(me.role, 'consumables.log') ? (
          <Link to={paths.home.getHref()} className="inline-flex min-h-touch items-center rounded border border-steel-400 bg-white px-4 font-semibold">
            Back to the stations
          </Link>
        ) : (
          <Link to={paths.machines.getHref()} className="inline-flex min-h-touch items-center rounded border border-steel-400 bg-white px-4 font-semibold">
            Open the machine list
          </Link>
        )}
      </div>
    );
  if (!q.data) return <p role="status">Loading station…</p>;
  const s = q.data;
  return (
    <div className="space-y-4">
      {notice ? (
        <Notice tone={notice.tone} role="status" title={notice.title}>
          {notice.text}
        </Notice>
      ) : null}
      {status.data ? <StateBanner status={status.data} /> : null}
      <LockoutAlarmBanner alarms={s.alarms ?? []} />
      <LockoutBanner lockouts={s.lockouts} />
      <PpeSignedNotice code={s.machine.code} />
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <p className="text-sm font-semibold uppercase tracking-wider text-steel-600">Station</p>
          <h1 className="text-3xl font-bold">
            {s.machine.code} · {s.machine.name}
          </h1>
          <p className="text-steel-700">{[MACHINE_KIND_LABELS[s.machine.kind as MachineKind], s.machine.location].filter(Boolean).join(' · ')}</p>
        </div>
        <div className="no-print flex flex-wrap gap-2">
          {can(me.role, 'safety.ppe.sign') ? <PpeCheckLink machineId={s.machine.id} code={s.machine.code} /> : null}
          <Link
            to={paths.machine.getHref(s.machine.id)}
            className="inline-flex min-h-touch items-center rounded border border-steel-400 bg-white px-4 font-semibold"
          >
            Machine record
          </Link>
          <Link
            to={paths.stationLabel.getHref(s.machine.code)}
            className="inline-flex min-h-touch items-center rounded border border-steel-400 bg-white px-4 font-semibold"
          >
            Print QR label
          </Link>
        </div>
      </div>
      <div className="no-print flex flex-wrap items-start gap-2">
        {PRE_USE_KINDS.has(s.machine.kind) && can(me.role, 'machines.pre-use.sign') ? (
          <Link
            to={paths.stationPreUseCheck.getHref(s.machine.code)}
            className="inline-flex min-h-touch items-center rounded bg-steel-800 px-4 py-2 font-semibold text-white hover:bg-steel-700"
          >
            Pre-use check
            {preUse.data ? (
              <span className="ml-2 text-sm font-normal">{preUse.data.dueToday ? '· due' : preUse.data.checkedToday ? '· done today ✓' : ''}</span>
            ) : null}
          </Link>
        ) : null}
        {can(me.role, 'work-orders.raise') ? (
          <div className="min-w-[16rem] flex-1">
            <FaultReport code={s.machine.code} workOrderHref={paths.workOrder.getHref} />
          </div>
        ) : null}
        {status.data?.state === 'out-of-service' && can(me.role, 'machines.state') ? <ReturnToServiceButton code={s.machine.code} /> : null}
      </div>
      <DueList code={s.machine.code} rows={s.due} />
      {s.torches.length === 0 && CUTS_WITH_PLASMA.includes(s.machine.kind as MachineKind) ? (
        <Notice title="No torch on this machine">
          Consumables are logged on a torch. Add a component of kind “Plasma torch” to {s.machine.code} with arc-start and arc-time meters.
        </Notice>
      ) : null}
      {s.torches.map((t) => (
        <TorchPanel key={t.id} torch={t} parts={s.partOptions} pitLimit={s.reference.pitLimitMm} canLog={can(me.role, 'consumables.log')} />
      ))}
      {can(me.role, 'readings.record') && s.meters.length ? <RecordCountersPanel meters={s.meters} /> : null}
      {s.tools.length ? (
        <Panel title="Punch tools">
          <ToolsSummary tools={s.tools} />
        </Panel>
      ) : null}
      <Panel title="Latest counters">
        <MetersTable meters={s.meters} compact />
      </Panel>
      {s.torches.length ? (
        <Panel title="Cut quality">
          <div className="space-y-4">
            {can(me.role, 'cutchecks.record') ? (
              <details className="rounded border border-steel-300 p-3">
                <summary className="flex min-h-touch cursor-pointer items-center font-bold">Record a test coupon</summary>
                <div className="mt-3">
                  <CutCheckForm torches={s.torches.map((t) => ({ id: t.id, code: t.code }))} tolerance={s.reference.cutToleranceMm} />
                </div>
              </details>
            ) : null}
            <CutChecksTable machineId={s.machine.id} pageSize={5} />
          </div>
        </Panel>
      ) : null}
      {s.torches.length || s.recentChanges.length ? (
        <Panel title="Recent consumable changes">
          <RecentChanges rows={s.recentChanges} />
        </Panel>
      ) : null}
    </div>
  );
}
