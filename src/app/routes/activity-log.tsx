import { PageTitle } from '../../components/layout/app-shell';
import { Panel } from '../../components/ui/notice';
import { ActivityLogTable } from '../../features/activity-log/components/activity-log-table';
import { queryClient } from '../../lib/query-client';
import { getActivityLogQueryOptions } from '../../features/activity-log/api/get-activity-log';
import { useMe } from '../../features/auth/api/get-me';

export const loader = () => queryClient.ensureQueryData(getActivityLogQueryOptions({ page: 1, pageSize: 25 })).catch(() => null);

export function Component() {
  const { data: me } = useMe();
  if (!me) return null;
  return (
    <>
      <PageTitle title="Activity" subtitle="Who did what, newest first: sign-ins, invitations, role changes and every recorded change." />
      <Panel>
        <ActivityLogTable />
      </Panel>
    </>
  );
}
