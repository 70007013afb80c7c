import { PageTitle } from '../../components/layout/app-shell';
import { Notice } from '../../components/ui/notice';
import { useMe } from '../../features/auth/api/get-me';
import { PpeRequirements } from '../../features/safety/components/ppe-requirements';
import { queryClient } from '../../lib/query-client';
import { getPpeRequirementsQueryOptions } from '../../features/safety/api/get-ppe-requirements';
import { can } from '../../../shared/permissions';

export const loader = () => queryClient.ensureQueryData(getPpeRequirementsQueryOptions()).catch(() => null);

export function Component() {
  const { data: me } = useMe();
  if (!me) return null;
  if (!can(me.role, 'safety.ppe.manage')) return <Notice tone="danger">Only the safety officer sets PPE requirements.</Notice>;
  return (
    <>
      <PageTitle
        title="PPE requirements"
        subtitle="What each task at each machine needs. Lens shade follows the arc current and hearing protection the noise dose; sources are shown and the site can override them in settings."
      />
      <PpeRequirements />
    </>
  );
}
