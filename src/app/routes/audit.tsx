import { PageTitle } from '../../components/layout/app-shell';
import { Panel } from '../../components/ui/notice';
import { AuditTable } from '../../features/audit/components/audit-table';
import { queryClient } from '../../lib/query-client';
import { getAuditEventsQueryOptions } from '../../features/audit/api/get-audit-events';
import { useMe } from '../../features/auth/api/get-me';

export const loader = () => queryClient.ensureQueryData(getAuditEventsQueryOptions({ page: 1, pageSize: 25 })).catch(() => null);

export function Component() {
  const { data: me } = useMe();
  if (!me) return null;
  return (
    <>
      <PageTitle title="Activity" subtitle="Who did what, newest first: sign-ins, invitations, role changes and every recorded change." />
      <Panel>
        <AuditTable timeZone={me.organization.timeZone} />
      </Panel>
    </>
  );
}
