import { useParams, type LoaderFunctionArgs } from 'react-router-dom';
import { Breadcrumbs, PageTitle } from '../../components/layout/app-shell';
import { Notice } from '../../components/ui/notice';
import { useMe } from '../../features/auth/api/get-me';
import { getLockoutQueryOptions, useLockout } from '../../features/safety/api/get-lockout';
import { LockoutDetailView } from '../../features/safety/components/lockout-detail';
import { queryClient } from '../../lib/query-client';
import { paths } from '../../config/paths';

export const loader = ({ params }: LoaderFunctionArgs) => queryClient.ensureQueryData(getLockoutQueryOptions(params.id!)).catch(() => null);

export function Component() {
  const { id } = useParams();
  const { data: me } = useMe();
  const q = useLockout(id!);
  if (!me) return null;
  if (q.isError)
    return (
      <Notice tone="danger" role="alert">
        {q.error.message}
      </Notice>
    );
  if (!q.data) return <p role="status">Loading…</p>;
  return (
    <>
      <Breadcrumbs
        trail={[
          { to: paths.safety.getHref(), label: 'Safety' },
          { to: paths.safetyLockouts.getHref(), label: 'Lockouts' },
        ]}
        current={q.data.machineCode}
      />
      <PageTitle title={`Lockout of ${q.data.machineCode} · ${q.data.machineName}`} subtitle={q.data.reason} />
      <LockoutDetailView lockout={q.data} me={{ id: me.user.id, name: me.user.name, role: me.role }} />
    </>
  );
}
