import { useState } from 'react';
import { Link, useParams, type LoaderFunctionArgs } from 'react-router-dom';
import { PageTitle } from '../../components/layout/app-shell';
import { DetailPage } from '../../components/layout/detail-page';
import { Panel, Notice, Badge } from '../../components/ui/notice';
import { Button } from '../../components/ui/button';
import { MachinesTable } from '../../features/machines/components/machines-table';
import { MachineForm } from '../../features/machines/components/machine-form';
import { MachinePhotos } from '../../features/machines/components/machine-photos';
import { getMachineQueryOptions, useMachine } from '../../features/machines/api/get-machine';
import { useMachines } from '../../features/machines/api/get-machines';
import { useUpdateMachine } from '../../features/machines/api/update-machine';
import { MetersTable } from '../../features/meters/components/meters-table';
import { MeterForm } from '../../features/meters/components/meter-form';
import { ToolsTable } from '../../features/punch-tools/components/tools-table';
import { ToolForm } from '../../features/punch-tools/components/tool-form';
import { ChangesHistory } from '../../features/station/components/recent-changes';
import { LightCurtainCheck } from '../../features/machine-state/components/light-curtain-check';
import { MachineStops } from '../../features/machine-state/components/machine-stops';
import { useMe } from '../../features/auth/api/get-me';
import { queryClient } from '../../lib/query-client';
import { can } from '../../../shared/permissions';
import { MACHINE_KIND_LABELS } from '../../../shared/schemas/machines';
import { paths } from '../../config/paths';

export const loader = ({ params }: LoaderFunctionArgs) => queryClient.ensureQueryData(getMachineQueryOptions(params.id!)).catch(() => null);

const STATION_KINDS = new Set(['punch-plasma-cell', 'plasma-table', 'torch', 'punch-head']);

export function Component() {
  const { id } = useParams();
  const { data: me } = useMe();
  const q = useMachine(id!);
  const all = useMachines({ includeInactive: true });
  const update = useUpdateMachine();
  const [editing, setEditing] = useState(false);
  if (!me) return null;
  return (
    <DetailPage
      query={q}
      trail={(m) => [
        { label: 'Machines', to: paths.machines.getHref() },
        ...(m.parent ? [{ label: m.parent.code, to: paths.machine.getHref(m.parent.id) }] : []),
      ]}
      here={(m) => m.code}
    >
      {(m) => {
        const manage = can(me.role, 'machines.manage');
        const station = STATION_KINDS.has(m.kind) || m.components.some((c) => c.kind === 'torch');
        const punching = m.kind === 'punch-head' || m.components.some((c) => c.kind === 'punch-head');
        const hitMeters = m.meters.filter((x) => x.kind === 'count' && x.unit === 'hits');
        const heads = [m, ...m.components].filter((c) => c.kind === 'punch-head');
        return (
          <>
            <PageTitle
              title={`${m.code} · ${m.name}`}
              subtitle={[MACHINE_KIND_LABELS[m.kind], m.location, m.serial ? `serial ${m.serial}` : null].filter(Boolean).join(' · ')}
              actions={
                <div className="flex flex-wrap gap-2">
                  {station ? (
                    <Link
                      to={paths.station.getHref(m.parent && m.kind !== 'punch-plasma-cell' && m.kind !== 'plasma-table' ? m.parent.code : m.code)}
                      className="inline-flex min-h-touch items-center rounded bg-steel-800 px-4 font-semibold text-white"
                    >
                      Open station page
                    </Link>
                  ) : null}
                  {manage ? (
                    <Button variant="secondary" onClick={() => setEditing((e) => !e)} aria-expanded={editing}>
                      {editing ? 'Close editing' : 'Edit'}
                    </Button>
                  ) : null}
                  {manage ? (
                    <Button variant="secondary" busy={update.isPending} onClick={() => update.mutate({ id: m.id, active: !m.active })}>
                      {m.active ? 'Retire' : 'Return to service'}
                    </Button>
                  ) : null}
                </div>
              }
            />
            {!m.active ? <Notice tone="info">This machine is retired: it is hidden from lists and station pages, and its history stays.</Notice> : null}
            {m.notes ? (
              <Panel title="Notes">
                <p className="whitespace-pre-line">{m.notes}</p>
              </Panel>
            ) : null}
            {editing ? (
              <Panel title={`Edit ${m.code}`}>
                <MachineForm machines={all.data ?? []} machine={m} onDone={() => setEditing(false)} />
              </Panel>
            ) : null}
            <Panel title="Photos">
              <MachinePhotos machineId={m.id} code={m.code} canManage={manage} />
            </Panel>
            <Panel title="Components" actions={<Badge>{m.components.length}</Badge>}>
              <MachinesTable rows={m.components} />
              {manage ? (
                <details className="mt-4">
                  <summary className="inline-flex min-h-touch cursor-pointer items-center font-semibold underline">Add a component to {m.code}</summary>
                  <div className="mt-3">
                    <MachineForm machines={all.data ?? []} defaultParentId={m.id} />
                  </div>
                </details>
              ) : null}
            </Panel>
            {punching ? (
              <Panel title="Punch tools">
                <ToolsTable machineId={m.id} canManage={can(me.role, 'tools.manage')} />
                {can(me.role, 'tools.manage') && heads[0] ? (
                  <details className="mt-4">
                    <summary className="inline-flex min-h-touch cursor-pointer items-center font-semibold underline">Add a punch tool</summary>
                    <div className="mt-3">
                      <ToolForm machineId={heads[0].id} hitMeters={hitMeters} />
                    </div>
                  </details>
                ) : null}
              </Panel>
            ) : null}
            {m.kind === 'torch' || m.components.some((c) => c.kind === 'torch') ? (
              <Panel title="Consumable changes">
                <ChangesHistory machineId={m.id} />
              </Panel>
            ) : null}
            <Panel title="Stops and service state">
              <MachineStops code={m.code} canChange={m.active && can(me.role, 'machines.state')} />
            </Panel>
            {m.kind === 'press-brake' ? (
              <Panel title="Light-curtain stopping-time check">
                <LightCurtainCheck code={m.code} canRecord={m.active && can(me.role, 'safety.inspection.perform')} />
              </Panel>
            ) : null}
            <Panel title="Meters">
              <MetersTable meters={m.meters} />
              {can(me.role, 'meters.manage') ? (
                <details className="mt-4">
                  <summary className="inline-flex min-h-touch cursor-pointer items-center font-semibold underline">Add a meter</summary>
                  <div className="mt-3">
                    <MeterForm machines={[m, ...m.components]} />
                  </div>
                </details>
              ) : null}
            </Panel>
          </>
        );
      }}
    </DetailPage>
  );
}
