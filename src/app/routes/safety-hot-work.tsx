import { PageTitle } from '../../components/layout/app-shell';
import { useMe } from '../../features/auth/api/get-me';
import { HotWork } from '../../features/safety/components/hot-work';
import { queryClient } from '../../lib/query-client';
import { getFireWatchesQueryOptions } from '../../features/safety/api/get-fire-watches';

export const loader = () => queryClient.ensureQueryData(getFireWatchesQueryOptions()).catch(() => null);

export function Component() {
  const { data: me } = useMe();
  if (!me) return null;
  return (
    <>
      <PageTitle title="Fire watch" subtitle="After plasma cutting, someone stays and watches for smouldering fires for the time the site’s rule sets." />
      <HotWork me={{ id: me.user.id, name: me.user.name, role: me.role }} />
    </>
  );
}
