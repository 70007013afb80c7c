import { useParams, type LoaderFunctionArgs } from 'react-router-dom';
import { Breadcrumbs, PageTitle } from '../../components/layout/app-shell';
import { Panel, Notice } from '../../components/ui/notice';
import { getMeterQueryOptions, useMeter } from '../../features/meters/api/get-meter';
import { ReadingForm } from '../../features/meters/components/reading-form';
import { ReadingsTable } from '../../features/meters/components/readings-table';
import { TrendChart } from '../../features/meters/components/trend-chart';
import { MeterEditForm } from '../../features/meters/components/meter-edit-form';
import { formatValue } from '../../features/meters/components/format';
import { useShopFormat } from '../../lib/format';
import { useMe } from '../../features/auth/api/get-me';
import { queryClient } from '../../lib/query-client';
import { can } from '../../../shared/permissions';
import { paths } from '../../config/paths';

export const loader = ({ params }: LoaderFunctionArgs) => queryClient.ensureQueryData(getMeterQueryOptions(params.id!)).catch(() => null);

const KIND = { count: 'count', 'running-time': 'running time', condition: 'condition reading' } as const;

export function Component() {
  const { id } = useParams();
  const { data: me } = useMe();
  const q = useMeter(id!);
  const f = useShopFormat();
  if (!me) return null;
  if (q.isError)
    return (
      <Notice tone="danger" role="alert">
        {q.error.message}
      </Notice>
    );
  if (!q.data) return <p role="status">Loading…</p>;
  const m = q.data;
  return (
    <>
      <Breadcrumbs
        trail={[
          { to: paths.machines.getHref(), label: 'Machines' },
          { to: paths.machine.getHref(m.machineId), label: m.machineCode },
        ]}
        current={m.name}
      />
      <PageTitle
        title={`${m.machineCode} · ${m.name}`}
        subtitle={`A ${KIND[m.kind]} in ${m.unit} · code ${m.code}${m.latest ? ` · latest ${formatValue(f, m.latest.value, m.unit)}` : ''}${m.upperLimit !== null ? ` · upper limit ${formatValue(f, m.upperLimit, m.unit)}` : ''}${m.lowerLimit !== null ? ` · lower limit ${formatValue(f, m.lowerLimit, m.unit)}` : ''}`}
      />
      <Panel title="Trend, last 12 months">
        <TrendChart meterId={m.id} />
      </Panel>
      {can(me.role, 'readings.record') ? (
        <Panel title="Record a reading">
          <ReadingForm meter={m} />
        </Panel>
      ) : null}
      <Panel title="Readings">
        <ReadingsTable meter={m} />
      </Panel>
      {can(me.role, 'meters.manage') ? (
        <Panel title="Meter settings">
          <MeterEditForm key={m.id} meter={m} />
        </Panel>
      ) : null}
    </>
  );
}
