import { useNavigate } from 'react-router-dom';
import { Breadcrumbs, PageTitle } from '../../components/layout/app-shell';
import { Panel } from '../../components/ui/notice';
import { PlanForm } from '../../features/plans/components/plan-form';
import { getLookupsQueryOptions, useLookups } from '../../lib/lookups';
import { useCreatePlan } from '../../features/plans/api/create-plan';
import { queryClient } from '../../lib/query-client';

export const loader = () => queryClient.ensureQueryData(getLookupsQueryOptions()).catch(() => null);

export function Component() {
  const lookups = useLookups();
  const create = useCreatePlan();
  const navigate = useNavigate();
  if (!lookups.data) return <p role="status">Loading…</p>;
  return (
    <>
      <Breadcrumbs trail={[{ to: '/plans', label: 'Plans' }]} current="New plan" />
      <PageTitle title="Write a maintenance plan" />
      <Panel>
        <PlanForm
          lookups={lookups.data}
          submitLabel="Save plan"
          cancelHref="/plans"
          onSubmit={async (v) => {
            const r = await create.mutateAsync(v);
            navigate(`/plans/${r.id}`);
          }}
        />
      </Panel>
    </>
  );
}
