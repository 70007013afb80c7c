import { PageTitle } from '../../components/layout/app-shell';
import { Notice, Panel } from '../../components/ui/notice';
import { queryClient } from '../../lib/query-client';
import { getOrganizationQueryOptions, useOrganization } from '../../features/org-settings/api/organization';
import { OrgSettingsForm } from '../../features/org-settings/components/org-settings-form';

export const loader = () => queryClient.ensureQueryData(getOrganizationQueryOptions()).catch(() => null);

export function Component() {
  const org = useOrganization();
  return (
    <>
      <PageTitle title="Site settings" subtitle="The shop’s name and the clock its schedules run on." />
      <Panel>
        {org.isError ? <Notice tone="danger">{org.error.message}</Notice> : null}
        {org.data ? <OrgSettingsForm org={org.data} /> : <p role="status">Loading…</p>}
      </Panel>
      <Notice tone="info">E-mail delivery (relay, sender address) is set by the server’s environment: see the README’s configuration table.</Notice>
    </>
  );
}
