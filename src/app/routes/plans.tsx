import { Link } from 'react-router-dom';
import { PageTitle } from '../../components/layout/app-shell';
import { Panel } from '../../components/ui/notice';
import { useMe } from '../../features/auth/api/get-me';
import { PlansTable } from '../../features/plans/components/plans-table';
import { StartersPanel } from '../../features/plans/components/starters-panel';
import { getLookupsQueryOptions, useLookups } from '../../lib/lookups';
import { queryClient } from '../../lib/query-client';
import { can } from '../../../shared/permissions';

export const loader = () => queryClient.ensureQueryData(getLookupsQueryOptions()).catch(() => null);

export function Component() {
  const { data: me } = useMe();
  const lookups = useLookups();
  if (!me) return null;
  const manage = can(me.role, 'plans.manage');
  return (
    <>
      <PageTitle
        title="Maintenance plans"
        subtitle="Recurring work per machine: by calendar, by meter, by condition — whichever comes first."
        actions={
          manage ? (
            <div className="flex flex-wrap gap-2">
              {/* The starter panel sits below a list that grows with the shop: a way straight to it. */}
              <a
                className="inline-flex min-h-touch items-center rounded border border-steel-500 bg-white px-4 font-semibold text-steel-900"
                href="#starter-plans"
              >
                Apply starter plans
              </a>
              <Link className="inline-flex min-h-touch items-center rounded bg-steel-800 px-4 font-semibold text-white" to="/plans/new">
                Write a plan
              </Link>
            </div>
          ) : null
        }
      />
      <Panel>
        <PlansTable />
      </Panel>
      {manage && lookups.data ? (
        <div id="starter-plans" className="scroll-mt-4">
          <Panel title="Starter plans">
            <StartersPanel lookups={lookups.data} />
          </Panel>
        </div>
      ) : null}
    </>
  );
}
