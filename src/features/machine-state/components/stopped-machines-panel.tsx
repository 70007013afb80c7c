import { Link } from 'react-router-dom';
import { useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { Notice, Panel } from '../../../components/ui/notice';
import { MachineStateBadge } from '../../../components/ui/machine-state-badge';
import { useShopFormat } from '../../../lib/format';
import { paths } from '../../../config/paths';
import type { MachineRow } from '../../../../shared/schemas/machines';
import { machineStateKeys } from '../api/keys';

/** For the home pages: which machines may not be run right now, and why. */
export function StoppedMachinesPanel() {
  const f = useShopFormat();
  const q = useQuery({ queryKey: [...machineStateKeys.all, 'machines'], queryFn: () => api<MachineRow[]>('/machines'), staleTime: 10_000 });
  const stopped = (q.data ?? []).filter((m) => m.status.state !== 'in-service');
  return (
    <Panel title="Machine states">
      {q.isError ? <Notice tone="danger">{q.error.message}</Notice> : null}
      {q.data && stopped.length === 0 ? (
        <p className="flex items-center gap-2">
          <MachineStateBadge state="in-service" /> Every machine is in service.
        </p>
      ) : null}
      <ul className="space-y-2">
        {stopped.map((m) => (
          <li key={m.id}>
            <Link to={paths.station.getHref(m.code)} className="flex min-h-touch flex-wrap items-center gap-2 underline-offset-2 hover:underline">
              <MachineStateBadge state={m.status.state} />
              <span className="font-bold">{m.code}</span>
              <span className="text-steel-700">
                {m.status.reason ?? ''}
                {m.status.since ? ` · since ${f.dateTime(m.status.since)}` : ''}
              </span>
            </Link>
          </li>
        ))}
      </ul>
    </Panel>
  );
}
