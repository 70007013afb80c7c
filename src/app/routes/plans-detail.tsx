import { Link, useParams, type LoaderFunctionArgs } from 'react-router-dom';
import { PageTitle } from '../../components/layout/app-shell';
import { DetailPage } from '../../components/layout/detail-page';
import { Panel } from '../../components/ui/notice';
import { useMe } from '../../features/auth/api/get-me';
import { getPlanQueryOptions, usePlan } from '../../features/plans/api/get-plan';
import { PlanView } from '../../features/plans/components/plan-view';
import { WorkOrdersTable } from '../../features/work-orders/components/work-orders-table';
import { queryClient } from '../../lib/query-client';
import { can } from '../../../shared/permissions';

export const loader = ({ params }: LoaderFunctionArgs) => queryClient.ensureQueryData(getPlanQueryOptions(params.id!)).catch(() => null);

export function Component() {
  const { id } = useParams();
  const { data: me } = useMe();
  const q = usePlan(id!);
  if (!me) return null;
  return (
    <DetailPage query={q} trail={[{ label: 'Plans', to: '/plans' }]} here={(p) => p.title}>
      {(p) => (
        <>
          <PageTitle
            title={p.title}
            subtitle={`${p.machine.code} · ${p.machine.name}`}
            actions={
              can(me.role, 'plans.manage') ? (
                <Link className="inline-flex min-h-touch items-center rounded border border-steel-400 bg-white px-4 font-semibold" to={`/plans/${p.id}/edit`}>
                  Edit plan
                </Link>
              ) : null
            }
          />
          <PlanView plan={p} />
          <Panel title="Work orders from this plan">
            <WorkOrdersTable
              fixed={{ planId: p.id }}
              caption="Work orders from this plan"
              pageSize={10}
              defaultStatus="any"
              defaultSort={{ sort: 'number', dir: 'desc' }}
            />
          </Panel>
        </>
      )}
    </DetailPage>
  );
}
