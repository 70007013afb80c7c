import { useState } from 'react';
import { createColumnHelper } from '@tanstack/react-table';
import { DataTable } from '../../../components/ui/data-table';
import { Badge, EmptyState, Notice } from '../../../components/ui/notice';
import { Button } from '../../../components/ui/button';
import { ConfirmDialog } from '../../../components/ui/confirm-dialog';
import { WorkCaution } from '../../../components/ui/caution';
import type { PunchToolRow } from '../../../../shared/schemas/punch-tools';
import { usePunchTools } from '../api/get-punch-tools';
import { useRecordSharpening } from '../api/record-sharpening';
import { useShopFormat } from '../../../lib/format';

const col = createColumnHelper<PunchToolRow>();

/** Punch tools with hits since their last sharpening; reaching the interval raises a caution badge. */
export function ToolsTable({ machineId, canManage }: { machineId?: string; canManage: boolean }) {
  const f = useShopFormat();
  const q = usePunchTools(machineId);
  const sharpen = useRecordSharpening();
  const [pending, setPending] = useState<PunchToolRow | null>(null);
  const [removed, setRemoved] = useState('');
  const [message, setMessage] = useState<{ tone: 'safe' | 'danger'; text: string } | null>(null);
  const columns = [
    col.accessor('code', { header: 'Tool', enableHiding: false, cell: (c) => <span className="font-bold">{c.getValue()}</span> }),
    col.accessor('name', { header: 'Shape' }),
    col.accessor('stationSize', { header: 'Station' }),
    col.accessor('fraction', {
      header: 'Hits since sharpening',
      cell: (c) => {
        const r = c.row.original;
        const pct = r.fraction === null ? 0 : Math.min(100, r.fraction * 100);
        return (
          <div className="min-w-48 space-y-1">
            <div className="h-3 overflow-hidden rounded border border-steel-400 bg-steel-100" aria-hidden>
              <div className={`h-full ${r.due ? 'bg-caution' : 'bg-steel-600'}`} style={{ width: `${pct}%` }} />
            </div>
            <span className="tabular-nums">
              {r.hitsSince === null ? 'no hits counted yet' : `${f.number(r.hitsSince, { max: 0 })} of ${f.number(r.sharpeningIntervalHits, { max: 0 })} hits`}
            </span>
          </div>
        );
      },
    }),
    col.accessor('due', {
      header: 'State',
      cell: (c) => (c.getValue() ? <Badge tone="caution">Sharpening due</Badge> : <span className="text-steel-700">Within interval</span>),
    }),
    col.accessor('lastSharpenedAt', { header: 'Last sharpened', cell: (c) => (c.getValue() ? f.date(c.getValue()) : 'not yet') }),
    col.accessor('sharpenings', { header: 'Sharpenings' }),
    ...(canManage
      ? [
          col.display({
            id: 'act',
            header: 'Record',
            cell: (c) => (
              <Button variant="secondary" onClick={() => (setRemoved(''), setPending(c.row.original))} aria-label={`Sharpened ${c.row.original.code}`}>
                Sharpened
              </Button>
            ),
          }),
        ]
      : []),
  ];
  if (q.isError) return <Notice tone="danger">{q.error.message}</Notice>;
  return (
    <div className="space-y-3">
      {message ? (
        <Notice tone={message.tone} role="status">
          {message.text}
        </Notice>
      ) : null}
      <DataTable
        caption="Punch tools"
        columns={columns}
        data={q.data ?? []}
        loading={q.isLoading}
        getRowId={(r) => r.id}
        empty={<EmptyState title="No punch tools recorded" />}
      />
      <ConfirmDialog
        open={pending !== null}
        title={`Record a sharpening of ${pending?.code ?? ''}`}
        confirmLabel="Record sharpening"
        busy={sharpen.isPending}
        onCancel={() => setPending(null)}
        onConfirm={async () => {
          if (!pending) return;
          try {
            const res = await sharpen.mutateAsync({ toolId: pending.id, removedMm: removed === '' ? null : Number(removed) });
            setMessage({ tone: 'safe', text: `${pending.code} sharpened after ${f.number(res.hitsSincePrevious, { max: 0 })} hits; the count starts again.` });
          } catch (err) {
            setMessage({ tone: 'danger', text: err instanceof Error ? err.message : 'Could not record the sharpening' });
          }
          setPending(null);
        }}
      >
        <div className="space-y-3">
          <WorkCaution />
          <label className="block space-y-1 text-sm font-semibold">
            Ground off (mm, optional)
            <input
              inputMode="decimal"
              value={removed}
              onChange={(e) => setRemoved(e.target.value)}
              className="block min-h-touch w-full rounded border border-steel-400 px-3 font-normal"
            />
          </label>
        </div>
      </ConfirmDialog>
    </div>
  );
}
