import { Link } from 'react-router-dom';
import { Panel, EmptyState, Notice } from '../../../components/ui/notice';
import { useWorkOrders } from '../api/get-work-orders';
import { DueBadge, LockoutBadge } from '../../../components/ui/work-badges';
import { useShopFormat } from '../../../lib/format';

/** The home page's short list: my open work, most pressing first. */
export function MyWorkPanel({ scope = 'mine' }: { scope?: 'mine' | 'shop' }) {
  const f = useShopFormat();
  const who = scope === 'mine' ? { assignee: 'me' } : {};
  const base = scope === 'mine' ? '/work-orders?assignee=me' : '/work-orders?';
  const q = useWorkOrders({ page: 1, pageSize: 6, ...who, status: 'active', sort: 'dueAt', dir: 'asc' });
  const overdue = useWorkOrders({ page: 1, pageSize: 1, ...who, status: 'active', due: 'overdue' });
  return (
    <Panel
      title={scope === 'mine' ? 'My open work' : 'Open work in the shop'}
      actions={
        <Link className="inline-flex min-h-touch items-center font-semibold text-mandatory underline" to={base}>
          {scope === 'mine' ? 'All my work' : 'All work orders'}
        </Link>
      }
    >
      {q.isError ? <Notice tone="danger">{q.error.message}</Notice> : null}
      {overdue.data && overdue.data.total > 0 ? (
        <div className="mb-3">
          <Notice tone="danger" title={`${overdue.data.total} past due`}>
            <Link className="inline-flex min-h-touch items-center font-semibold underline" to={`${base}&due=overdue`}>
              Show past-due work
            </Link>
          </Notice>
        </div>
      ) : null}
      {q.data && q.data.rows.length === 0 ? (
        <EmptyState title={scope === 'mine' ? 'Nothing open for you' : 'No open work'}>
          New work appears here when a plan falls due or someone reports a fault.
        </EmptyState>
      ) : null}
      <ul className="divide-y divide-steel-200">
        {(q.data?.rows ?? []).map((w) => (
          <li key={w.id}>
            <Link to={`/work-orders/${w.id}`} className="flex min-h-touch flex-wrap items-center gap-x-3 gap-y-1 py-2 hover:bg-steel-50">
              <span className="font-bold text-mandatory">WO {w.number}</span>
              <span className="font-semibold">{w.title}</span>
              <span className="text-steel-600">{w.machine.code}</span>
              <span className="ml-auto flex items-center gap-2 text-sm">
                {w.requiresLockout ? <LockoutBadge /> : null}
                <DueBadge state={w.dueState} />
                <span className="text-steel-700" title={f.dateTime(w.dueAt)}>
                  {f.relative(w.dueAt)}
                </span>
              </span>
            </Link>
          </li>
        ))}
      </ul>
    </Panel>
  );
}
