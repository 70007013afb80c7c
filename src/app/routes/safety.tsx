import { PageTitle } from '../../components/layout/app-shell';
import { useMe } from '../../features/auth/api/get-me';
import { SafetyHub } from '../../features/safety/components/safety-hub';
import { queryClient } from '../../lib/query-client';
import { getSafetyTasksQueryOptions } from '../../features/safety/api/get-safety-tasks';
import { getLockoutsQueryOptions } from '../../features/safety/api/get-lockouts';

export const loader = () =>
  Promise.all([
    queryClient.ensureQueryData(getSafetyTasksQueryOptions()),
    queryClient.ensureQueryData(getLockoutsQueryOptions({ state: 'open', page: 1, pageSize: 50 })),
  ]).catch(() => null);

export function Component() {
  const { data: me } = useMe();
  if (!me) return null;
  return (
    <>
      <PageTitle title="Safety log" subtitle="Lockouts, PPE checks, fire watch, procedures and inspections — each one signed and kept." />
      <SafetyHub role={me.role} />
    </>
  );
}
