import { useState } from 'react';
import { PageTitle } from '../../components/layout/app-shell';
import { Panel, Notice } from '../../components/ui/notice';
import { MachinesTable } from '../../features/machines/components/machines-table';
import { MachineForm } from '../../features/machines/components/machine-form';
import { getMachinesQueryOptions, useMachines } from '../../features/machines/api/get-machines';
import { useMe } from '../../features/auth/api/get-me';
import { queryClient } from '../../lib/query-client';
import { can } from '../../../shared/permissions';

export const loader = () => queryClient.ensureQueryData(getMachinesQueryOptions({})).catch(() => null);

export function Component() {
  const { data: me } = useMe();
  const [includeInactive, setIncludeInactive] = useState(false);
  const machines = useMachines({ includeInactive });
  if (!me) return null;
  return (
    <>
      <PageTitle title="Machines" subtitle="Every machine and its components — torches, punch heads, pumps — with their meters." />
      {can(me.role, 'machines.manage') ? (
        <Panel title="Add a machine or component">
          <MachineForm machines={machines.data ?? []} />
        </Panel>
      ) : null}
      <Panel>
        {machines.isError ? <Notice tone="danger">{machines.error.message}</Notice> : null}
        <MachinesTable
          rows={machines.data ?? []}
          loading={machines.isLoading}
          toolbar={
            <label className="flex min-h-touch items-center gap-2 text-sm font-semibold">
              <input type="checkbox" className="h-5 w-5" checked={includeInactive} onChange={(e) => setIncludeInactive(e.target.checked)} />
              Show retired machines
            </label>
          }
        />
      </Panel>
    </>
  );
}
