import { useMemo, useState } from 'react';
import { createColumnHelper, type SortingState } from '@tanstack/react-table';
import { DataTable } from '../../../components/ui/data-table';
import { Badge, EmptyState, Notice } from '../../../components/ui/notice';
import { Button } from '../../../components/ui/button';
import type { JobRunRow } from '../../../../shared/schemas/job-runs';
import { useJobRuns } from '../api/get-job-runs';
import { useRunPassNow } from '../api/run-pass-now';
import { ApiError } from '../../../lib/api-client';
import { useShopFormat } from '../../../lib/format';

const col = createColumnHelper<JobRunRow>();

/** "still running", "20 ms", "3.4 s", "2 min 5 s": short enough to stay on one line on a tablet. */
function took(ms: number | null): string {
  if (ms === null) return 'still running';
  if (ms < 1000) return `${Math.max(1, Math.round(ms))} ms`;
  if (ms < 60_000) return `${(ms / 1000).toFixed(1)} s`;
  return `${Math.floor(ms / 60_000)} min ${Math.round((ms % 60_000) / 1000)} s`;
}

/** Each pass of the scheduled job for this shop, newest first, with a button to run one now. */
export function JobRuns() {
  const f = useShopFormat();
  const [page, setPage] = useState(1);
  const [sorting, setSorting] = useState<SortingState>([]);
  const [message, setMessage] = useState<{ tone: 'danger' | 'safe' | 'caution'; text: string } | null>(null);
  const pageSize = 25;
  const q = useJobRuns({ page, pageSize });
  const run = useRunPassNow();
  const columns = useMemo(
    () => [
      col.accessor('startedAt', {
        header: 'Started',
        enableSorting: false,
        cell: (c) => <span className="whitespace-nowrap">{f.dateTime(c.getValue(), { seconds: true })}</span>,
      }),
      col.accessor((r) => (r.finishedAt ? new Date(r.finishedAt).getTime() - new Date(r.startedAt).getTime() : null), {
        id: 'took',
        header: 'Took',
        enableSorting: false,
        cell: (c) => <span className="whitespace-nowrap">{took(c.getValue() as number | null)}</span>,
      }),
      // Problems early: on a tablet the right-hand columns scroll out of sight.
      col.accessor('errors', {
        header: 'Problems',
        enableSorting: false,
        cell: (c) =>
          c.getValue().length ? (
            <details>
              <summary className="cursor-pointer">
                <Badge tone="danger">
                  {c.getValue().length} problem{c.getValue().length === 1 ? '' : 's'}
                </Badge>
              </summary>
              <ul className="mt-1 list-disc pl-5 text-xs">
                {c.getValue().map((e, i) => (
                  <li key={i}>{e.message}</li>
                ))}
              </ul>
            </details>
          ) : (
            <Badge tone="safe">None</Badge>
          ),
      }),
      col.accessor('trigger', {
        header: 'Started by',
        enableSorting: false,
        cell: (c) => (c.getValue() === 'manual' ? `Run now (${c.row.original.triggeredBy ?? 'admin'})` : 'Schedule'),
      }),
      col.accessor('plansChecked', { header: 'Plans checked', enableSorting: false }),
      col.accessor('plansEvaluated', { header: 'Re-evaluated', enableSorting: false }),
      col.accessor('workOrdersRaised', { header: 'Work raised', enableSorting: false }),
      col.accessor('escalations', { header: 'Past due reported', enableSorting: false }),
      col.accessor('mailsQueued', { header: 'Mails', enableSorting: false }),
    ],
    [f],
  );
  const runNow = async () => {
    setMessage(null);
    try {
      const r = await run.mutateAsync();
      setMessage({
        tone: 'safe',
        text: r.run
          ? `Pass finished: ${r.run.plansChecked} plans checked, ${r.run.workOrdersRaised} work orders raised, ${r.run.mailsQueued} mails queued.`
          : r.message,
      });
    } catch (err) {
      setMessage({ tone: err instanceof ApiError && err.status === 409 ? 'caution' : 'danger', text: err instanceof Error ? err.message : 'The pass failed' });
    }
  };
  return (
    <div className="space-y-3">
      <div className="flex flex-wrap items-center gap-3">
        <Button onClick={runNow} busy={run.isPending}>
          Run the pass now
        </Button>
        <p className="text-sm text-steel-600">The pass also runs on its own every few minutes.</p>
      </div>
      {message ? (
        <Notice tone={message.tone} role="status">
          {message.text}
        </Notice>
      ) : null}
      <DataTable
        caption="Scheduled passes"
        columns={columns}
        data={q.data?.rows ?? []}
        loading={q.isLoading}
        getRowId={(r) => r.id}
        empty={
          <EmptyState title="No passes recorded yet">
            Each pass checks every plan, raises the work that has fallen due and queues its mails. Use “Run the pass now” to start one at once.
          </EmptyState>
        }
        server={{ total: q.data?.total ?? 0, page, pageSize, sorting, onSortingChange: setSorting, onPageChange: setPage }}
      />
    </div>
  );
}
