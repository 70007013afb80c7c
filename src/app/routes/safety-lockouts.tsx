import { Link } from 'react-router-dom';
import { PageTitle } from '../../components/layout/app-shell';
import { Panel } from '../../components/ui/notice';
import { useMe } from '../../features/auth/api/get-me';
import { LockoutsTable } from '../../features/safety/components/lockouts-table';
import { paths } from '../../config/paths';
import { can } from '../../../shared/permissions';

export function Component() {
  const { data: me } = useMe();
  if (!me) return null;
  return (
    <>
      <PageTitle
        title="Lockouts"
        subtitle="Every application of an energy-control procedure, from the first lock on to the last lock off."
        actions={
          can(me.role, 'safety.lockout.sign') ? (
            <Link className="flex min-h-touch items-center rounded bg-danger px-4 font-semibold text-white" to={paths.safetyLockoutNew.getHref()}>
              Lock out a machine
            </Link>
          ) : null
        }
      />
      <Panel>
        <LockoutsTable />
      </Panel>
    </>
  );
}
