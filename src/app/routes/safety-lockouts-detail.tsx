import { useParams, type LoaderFunctionArgs } from 'react-router-dom';
import { PageTitle } from '../../components/layout/app-shell';
import { DetailPage } from '../../components/layout/detail-page';
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
  return (
    <DetailPage
      query={q}
      trail={[
        { label: 'Safety', to: paths.safety.getHref() },
        { label: 'Lockouts', to: paths.safetyLockouts.getHref() },
      ]}
      here={(l) => l.machineCode}
    >
      {(l) => (
        <>
          <PageTitle title={`Lockout of ${l.machineCode} · ${l.machineName}`} subtitle={l.reason} />
          <LockoutDetailView lockout={l} me={{ id: me.user.id, name: me.user.name, role: me.role }} />
        </>
      )}
    </DetailPage>
  );
}
