import { PageTitle } from '../../components/layout/app-shell';
import { Panel } from '../../components/ui/notice';
import { LowParts } from '../../features/purchasing/components/low-parts';
import { RequestsTable } from '../../features/purchasing/components/requests-table';
import { Suggestions } from '../../features/purchasing/components/suggestions';
import { Suppliers } from '../../features/purchasing/components/suppliers';
import { getRequestsQueryOptions } from '../../features/purchasing/api/get-requests';
import { useMe } from '../../features/auth/api/get-me';
import { queryClient } from '../../lib/query-client';
import { can } from '../../../shared/permissions';

export const loader = () => queryClient.ensureQueryData(getRequestsQueryOptions()).catch(() => null);

export function Component() {
  const { data: me } = useMe();
  if (!me) return null;
  return (
    <>
      <PageTitle
        title="Purchasing"
        subtitle="Parts are low when on hand plus on order is at or below the reorder point. Technicians raise requests and book receipts; the admin approves and orders."
      />
      <Panel title="Parts to reorder">
        <LowParts canRaise={can(me.role, 'purchasing.request')} />
      </Panel>
      <Panel title="Purchase requests">
        <RequestsTable
          rights={{ approve: can(me.role, 'purchasing.approve'), order: can(me.role, 'purchasing.order'), receive: can(me.role, 'purchasing.receive') }}
        />
      </Panel>
      <Panel title="Suggested order">
        <Suggestions />
      </Panel>
      <Panel title="Suppliers">
        <Suppliers canAdd={can(me.role, 'purchasing.suppliers')} />
      </Panel>
    </>
  );
}
