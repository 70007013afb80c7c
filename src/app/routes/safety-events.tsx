import { PageTitle } from '../../components/layout/app-shell';
import { Notice, Panel } from '../../components/ui/notice';
import { useMe } from '../../features/auth/api/get-me';
import { SafetyEventsTable } from '../../features/safety/components/safety-events-table';
import { can } from '../../../shared/permissions';

export function Component() {
  const { data: me } = useMe();
  if (!me) return null;
  if (!can(me.role, 'safety.audit')) return <Notice tone="danger">Refusals and alarms are for the safety officer and the admin.</Notice>;
  return (
    <>
      <PageTitle
        title="Refusals and alarms"
        subtitle="Attempts the product refused (a lock without authorization, approving one's own draft…) and alarms such as a counter that rose during a verified lockout."
      />
      <Panel>
        <SafetyEventsTable />
      </Panel>
    </>
  );
}
