import { useNavigate, useParams, type LoaderFunctionArgs } from 'react-router-dom';
import { Breadcrumbs, PageTitle } from '../../components/layout/app-shell';
import { Notice, Panel } from '../../components/ui/notice';
import { PlanForm, toFormValues } from '../../features/plans/components/plan-form';
import { getLookupsQueryOptions, useLookups } from '../../lib/lookups';
import { getPlanQueryOptions, usePlan } from '../../features/plans/api/get-plan';
import { useUpdatePlan } from '../../features/plans/api/update-plan';
import { queryClient } from '../../lib/query-client';

export const loader = ({ params }: LoaderFunctionArgs) =>
  Promise.all([queryClient.ensureQueryData(getLookupsQueryOptions()), queryClient.ensureQueryData(getPlanQueryOptions(params.id!))]).catch(() => null);

export function Component() {
  const { id } = useParams();
  const lookups = useLookups();
  const plan = usePlan(id!);
  const update = useUpdatePlan();
  const navigate = useNavigate();
  if (plan.isError)
    return (
      <Notice tone="danger" role="alert">
        {plan.error.message}
      </Notice>
    );
  if (!lookups.data || !plan.data) return <p role="status">Loading…</p>;
  return (
    <>
      <Breadcrumbs
        trail={[
          { to: '/plans', label: 'Plans' },
          { to: `/plans/${id}`, label: plan.data.title },
        ]}
        current="Edit"
      />
      <PageTitle title={`Edit: ${plan.data.title}`} />
      <Panel>
        <PlanForm
          lookups={lookups.data}
          initial={toFormValues(plan.data)}
          submitLabel="Save changes"
          cancelHref={`/plans/${id}`}
          onSubmit={async (v) => {
            await update.mutateAsync({ id: id!, input: v });
            navigate(`/plans/${id}`);
          }}
        />
      </Panel>
    </>
  );
}
