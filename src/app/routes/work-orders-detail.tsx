import { Link, useParams, type LoaderFunctionArgs } from 'react-router-dom';
import { PageTitle } from '../../components/layout/app-shell';
import { DetailPage } from '../../components/layout/detail-page';
import { Notice, Panel } from '../../components/ui/notice';
import { useMe } from '../../features/auth/api/get-me';
import { getWorkOrderQueryOptions, useWorkOrder } from '../../features/work-orders/api/get-work-order';
import { WorkOrderSummary } from '../../features/work-orders/components/work-order-summary';
import { WorkMoves } from '../../features/work-orders/components/work-moves';
import { ChecklistForm } from '../../features/work-orders/components/checklist-form';
import { FailedSafetyChecks } from '../../features/work-orders/components/failed-safety-checks';
import { PartsUsed } from '../../features/work-orders/components/parts-used';
import { WorkLogForm } from '../../features/work-orders/components/work-log-form';
import { CloseWork } from '../../features/work-orders/components/close-work';
import { Attachments } from '../../features/work-orders/components/attachments';
import { WorkHistory } from '../../features/work-orders/components/work-history';
import { ReplanForm } from '../../features/work-orders/components/replan-form';
import { queryClient } from '../../lib/query-client';
import { paths } from '../../config/paths';
import { can } from '../../../shared/permissions';

export const loader = ({ params }: LoaderFunctionArgs) => queryClient.ensureQueryData(getWorkOrderQueryOptions(params.id!)).catch(() => null);

export function Component() {
  const { id } = useParams();
  const { data: me } = useMe();
  const q = useWorkOrder(id!);
  if (!me) return null;
  return (
    <DetailPage query={q} trail={[{ label: 'Work orders', to: '/work-orders' }]} here={(wo) => `WO ${wo.number}`}>
      {(wo) => {
        const worker = can(me.role, 'work-orders.work');
        const open = wo.status !== 'done' && wo.status !== 'cancelled';
        const readOnly = !worker || !open;
        const failed = wo.checklist.filter((c) => c.result === 'fail');
        return (
          <>
            <PageTitle
              documentTitle={`WO ${wo.number}`}
              title={`WO ${wo.number} · ${wo.title}`}
              subtitle={`${wo.machine.code} ${wo.machine.name}`}
              actions={
                <div className="flex flex-wrap gap-2">
                  {worker && open ? <WorkMoves wo={wo} /> : null}
                  <a
                    className="inline-flex min-h-touch items-center rounded border border-steel-400 bg-white px-4 font-semibold"
                    href={`/api/work-orders/${wo.id}/pdf`}
                    target="_blank"
                    rel="noreferrer"
                  >
                    Print sheet (PDF)
                  </a>
                </div>
              }
            />
            <WorkOrderSummary wo={wo} />
            {worker && open ? (
              <Panel title="Who and when">
                <ReplanForm wo={wo} />
              </Panel>
            ) : null}
            <Panel title="Checklist">
              <ChecklistForm workOrderId={wo.id} lines={wo.checklist} readOnly={readOnly} />
              <FailedSafetyChecks wo={wo} role={me.role} open={open} />
              {failed.length && can(me.role, 'work-orders.raise') ? (
                <div className="mt-4">
                  <Notice tone="danger" title={`${failed.length} line${failed.length === 1 ? '' : 's'} not OK`}>
                    <p>{failed.map((c) => c.label).join('; ')}. If the repair is not done in this work, raise follow-up work so it is tracked.</p>
                    <Link
                      className="mt-2 inline-flex min-h-touch items-center rounded border-2 border-danger bg-white px-4 font-semibold text-danger-ink"
                      to={paths.workOrders.getHref({ raise: '1', machineId: wo.machine.id, from: String(wo.number) })}
                    >
                      Raise follow-up work
                    </Link>
                  </Notice>
                </div>
              ) : null}
            </Panel>
            <div className="grid gap-4 lg:grid-cols-2">
              <Panel title="Parts, oil and grease">
                <PartsUsed wo={wo} readOnly={readOnly} />
              </Panel>
              <Panel title="Time and notes">
                <WorkLogForm wo={wo} readOnly={readOnly} />
              </Panel>
            </div>
            <Panel title="Photos and files">
              <Attachments wo={wo} canUpload={worker} />
            </Panel>
            {worker && open ? (
              <Panel title="Sign off">
                <CloseWork wo={wo} />
              </Panel>
            ) : null}
            <Panel title="History">
              <WorkHistory wo={wo} />
            </Panel>
          </>
        );
      }}
    </DetailPage>
  );
}
