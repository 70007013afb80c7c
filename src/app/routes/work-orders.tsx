import { useState } from 'react';
import { useNavigate, useSearchParams } from 'react-router-dom';
import { PageTitle } from '../../components/layout/app-shell';
import { Panel } from '../../components/ui/notice';
import { Button } from '../../components/ui/button';
import { useMe } from '../../features/auth/api/get-me';
import { WorkOrdersTable } from '../../features/work-orders/components/work-orders-table';
import { RaiseWorkForm } from '../../features/work-orders/components/raise-work-form';
import { getLookupsQueryOptions } from '../../lib/lookups';
import { queryClient } from '../../lib/query-client';
import { can } from '../../../shared/permissions';

export const loader = () => queryClient.ensureQueryData(getLookupsQueryOptions()).catch(() => null);

export function Component() {
  const { data: me } = useMe();
  const navigate = useNavigate();
  // ?raise=1&machineId=…&from=1234 opens the form prefilled: follow-up work from a failed check.
  const [params] = useSearchParams();
  const [raising, setRaising] = useState(params.get('raise') === '1');
  const from = params.get('from');
  if (!me) return null;
  return (
    <>
      <PageTitle
        title="Work orders"
        subtitle="Planned work raised by the schedule and repairs reported by hand."
        actions={
          can(me.role, 'work-orders.raise') ? (
            <Button onClick={() => setRaising((r) => !r)} aria-expanded={raising}>
              {raising ? 'Close the form' : 'Report a fault or job'}
            </Button>
          ) : null
        }
      />
      {raising ? (
        <Panel title="Report a fault or job">
          <RaiseWorkForm
            defaultMachineId={params.get('raise') === '1' ? (params.get('machineId') ?? undefined) : undefined}
            defaultInstructions={from && /^\d+$/.test(from) ? `Follow-up to WO ${from}: ` : undefined}
            onRaised={(r) => navigate(`/work-orders/${r.id}`)}
          />
        </Panel>
      ) : null}
      <Panel>
        <WorkOrdersTable />
      </Panel>
    </>
  );
}
