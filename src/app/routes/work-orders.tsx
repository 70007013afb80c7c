import { useState } from 'react';
import { useNavigate } from 'react-router-dom';
import { PageTitle } from '../../components/layout/app-shell';
import { Panel } from '../../components/ui/notice';
import { Button } from '../../components/ui/button';
import { useMe } from '../../features/auth/api/get-me';
import { WorkOrdersTable } from '../../features/work-orders/components/work-orders-table';
import { RaiseWorkForm } from '../../features/work-orders/components/raise-work-form';
import { getWorkLookupsQueryOptions } from '../../features/work-orders/api/get-work-lookups';
import { queryClient } from '../../lib/query-client';
import { can } from '../../../shared/permissions';

export const loader = () => queryClient.ensureQueryData(getWorkLookupsQueryOptions()).catch(() => null);

export function Component() {
  const { data: me } = useMe();
  const navigate = useNavigate();
  const [raising, setRaising] = useState(false);
  if (!me) return null;
  return (
    <>
      <PageTitle
        title="Work orders"
        subtitle="Planned work raised by the schedule and repairs reported by hand."
        actions={can(me.role, 'work-orders.raise') ? <Button onClick={() => setRaising((r) => !r)} aria-expanded={raising}>{raising ? 'Close the form' : 'Report a fault or job'}</Button> : null}
      />
      {raising ? (
        <Panel title="Report a fault or job">
          <RaiseWorkForm timeZone={me.organization.timeZone} onRaised={(r) => navigate(`/work-orders/${r.id}`)} />
        </Panel>
      ) : null}
      <Panel>
        <WorkOrdersTable timeZone={me.organization.timeZone} />
      </Panel>
    </>
  );
}
