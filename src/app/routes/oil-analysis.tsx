import { useState } from 'react';
import { PageTitle } from '../../components/layout/app-shell';
import { EmptyState, Notice, Panel } from '../../components/ui/notice';
import { useMe } from '../../features/auth/api/get-me';
import { getOilUnitsQueryOptions, useOilUnits } from '../../features/oil-analysis/api/get-oil-units';
import { useOilAnalyses } from '../../features/oil-analysis/api/get-oil-analyses';
import { OilAnalysisForm } from '../../features/oil-analysis/components/oil-analysis-form';
import { OilTargetForm } from '../../features/oil-analysis/components/oil-target-form';
import { OilTrendCharts } from '../../features/oil-analysis/components/oil-trend-charts';
import { OilAnalysesTable } from '../../features/oil-analysis/components/oil-analyses-table';
import { OilVerdict } from '../../features/oil-analysis/components/oil-badges';
import { OilLatest } from '../../features/oil-analysis/components/oil-latest';
import { queryClient } from '../../lib/query-client';
import { can } from '../../../shared/permissions';

export const loader = () => queryClient.ensureQueryData(getOilUnitsQueryOptions()).catch(() => null);

export function Component() {
  const { data: me } = useMe();
  const units = useOilUnits();
  const [unitId, setUnitId] = useState<string | null>(null);
  const list = units.data?.units ?? [];
  const unit = list.find((u) => u.id === unitId) ?? list[0];
  const trend = useOilAnalyses({ machineId: unit?.id, page: 1, pageSize: 50 });
  if (!me) return null;
  if (units.isError)
    return (
      <Notice tone="danger" role="alert">
        {units.error.message}
      </Notice>
    );
  const record = can(me.role, 'oil.record');
  return (
    <>
      <PageTitle
        title="Oil analysis"
        subtitle="Hydraulic oil cleanliness (ISO 4406), viscosity (ISO VG band), water and temperature against each unit’s targets."
      />
      {list.length === 0 && units.data ? (
        <EmptyState title="No hydraulic units">Add a machine of kind “Hydraulic unit” to record oil results.</EmptyState>
      ) : null}
      {list.length ? (
        <div role="group" aria-label="Hydraulic units" className="flex flex-wrap gap-2">
          {list.map((u) => (
            <button
              key={u.id}
              aria-pressed={u.id === unit?.id}
              type="button"
              onClick={() => setUnitId(u.id)}
              className={`min-h-touch rounded border px-4 text-left ${u.id === unit?.id ? 'border-steel-900 bg-steel-900 text-white' : 'border-steel-400 bg-white'}`}
            >
              <span className="block font-semibold">
                {u.code} · {u.name}
              </span>
              <span className="block text-sm">{u.latest ? `Latest ${u.latest.isoCode}` : 'No results yet'}</span>
            </button>
          ))}
        </div>
      ) : null}
      {unit ? (
        <>
          <Panel title={`${unit.code}: latest result`} actions={unit.latest ? <OilVerdict row={unit.latest} /> : null}>
            {unit.latest ? <OilLatest row={unit.latest} target={unit.target} /> : <p className="text-steel-600">No results yet.</p>}
          </Panel>
          <Panel title="Trends">
            <OilTrendCharts rows={trend.data?.rows ?? []} target={unit.target} />
          </Panel>
          {record ? (
            <>
              <Panel title="Record a result">
                <OilAnalysisForm key={unit.id} units={list} defaultMachineId={unit.id} />
              </Panel>
              <Panel title={`Targets for ${unit.code}`}>
                <OilTargetForm key={unit.id} unit={unit} />
              </Panel>
            </>
          ) : null}
          <Panel title="All results">
            <OilAnalysesTable machineId={unit.id} />
          </Panel>
        </>
      ) : null}
    </>
  );
}
