import { PageTitle } from '../../components/layout/app-shell';
import { useMe } from '../../features/auth/api/get-me';
import { SafetyRecords } from '../../features/safety/components/records';
import { queryClient } from '../../lib/query-client';
import { getInspectionsQueryOptions } from '../../features/safety/api/get-inspections';
import { getTrainingQueryOptions } from '../../features/safety/api/get-training';

export const loader = () =>
  Promise.all([queryClient.ensureQueryData(getInspectionsQueryOptions()), queryClient.ensureQueryData(getTrainingQueryOptions())]).catch(() => null);

export function Component() {
  const { data: me } = useMe();
  if (!me) return null;
  return (
    <>
      <PageTitle
        title="Inspections and training"
        subtitle="The periodic inspection of each procedure, its certification, and who is trained on which version."
      />
      <SafetyRecords me={{ id: me.user.id, name: me.user.name, role: me.role }} />
    </>
  );
}
