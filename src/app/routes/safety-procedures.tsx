import { Link } from 'react-router-dom';
import { PageTitle } from '../../components/layout/app-shell';
import { Panel } from '../../components/ui/notice';
import { useMe } from '../../features/auth/api/get-me';
import { ProceduresTable } from '../../features/safety/components/procedures-table';
import { queryClient } from '../../lib/query-client';
import { getProceduresQueryOptions } from '../../features/safety/api/get-procedures';
import { paths } from '../../config/paths';
import { can } from '../../../shared/permissions';

export const loader = () => queryClient.ensureQueryData(getProceduresQueryOptions()).catch(() => null);

export function Component() {
  const { data: me } = useMe();
  if (!me) return null;
  return (
    <>
      <PageTitle
        title="Energy-control procedures"
        subtitle="One written procedure per machine, approved by the safety officer; changes make a new version."
        actions={
          can(me.role, 'safety.procedures.draft') ? (
            <Link className="flex min-h-touch items-center rounded bg-steel-800 px-4 font-semibold text-white" to={paths.safetyProcedureNew.getHref()}>
              Write a procedure
            </Link>
          ) : null
        }
      />
      <Panel>
        <ProceduresTable />
      </Panel>
    </>
  );
}
