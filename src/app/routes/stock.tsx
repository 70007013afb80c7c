import { useState } from 'react';
import { PageTitle } from '../../components/layout/app-shell';
import { Panel, Notice } from '../../components/ui/notice';
import { PartsTable } from '../../features/stock/components/parts-table';
import { PartForm } from '../../features/stock/components/part-form';
import { StockMoveForm } from '../../features/stock/components/stock-move-form';
import { MovesTable } from '../../features/stock/components/moves-table';
import { PartEditForm } from '../../features/stock/components/part-edit-form';
import { getPartTypesQueryOptions, usePartTypes } from '../../features/stock/api/get-part-types';
import { useMe } from '../../features/auth/api/get-me';
import { queryClient } from '../../lib/query-client';
import { can } from '../../../shared/permissions';

export const loader = () => queryClient.ensureQueryData(getPartTypesQueryOptions({})).catch(() => null);

export function Component() {
  const { data: me } = useMe();
  const [lowOnly, setLowOnly] = useState(false);
  const parts = usePartTypes({ lowOnly });
  const [selected, setSelected] = useState<string | null>(null);
  if (!me) return null;
  const part = parts.data?.find((p) => p.id === selected) ?? null;
  const manage = can(me.role, 'stock.manage');
  return (
    <>
      <PageTitle title="Stock" subtitle="Consumables and spares on the shelf. Reorder points learn from the last 90 days of use and each part's lead time." />
      <Panel>
        {parts.isError ? <Notice tone="danger">{parts.error.message}</Notice> : null}
        <PartsTable
          rows={parts.data ?? []}
          loading={parts.isLoading}
          selectedId={selected}
          onSelect={setSelected}
          toolbar={
            <label className="flex min-h-touch items-center gap-2 text-sm font-semibold">
              <input type="checkbox" className="h-5 w-5" checked={lowOnly} onChange={(e) => setLowOnly(e.target.checked)} />
              Only parts to reorder
            </label>
          }
        />
        <p className="mt-3 text-sm text-steel-700">
          Reorder point = expected use over the lead time + safety stock (z × daily spread × √lead time), rounded up; the continuous-review model of
          operations-management texts. A part is marked <strong>Reorder</strong> at or below it.
        </p>
      </Panel>
      {part ? (
        <Panel title={`${part.partNumber} · ${part.name}`}>
          <div className="space-y-4">
            {manage ? <StockMoveForm key={part.id} part={part} /> : null}
            <MovesTable partTypeId={part.id} unit={part.stockUnit} />
            {manage ? (
              <details className="rounded border border-steel-300 p-3">
                <summary className="flex min-h-touch cursor-pointer items-center font-semibold">Edit catalogue data of {part.partNumber}</summary>
                <div className="mt-3">
                  <PartEditForm key={part.id} part={part} />
                </div>
              </details>
            ) : null}
          </div>
        </Panel>
      ) : null}
      {manage ? (
        <Panel title="Add a part to the catalogue">
          <PartForm />
        </Panel>
      ) : null}
    </>
  );
}
