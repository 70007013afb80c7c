import { useSearchParams } from 'react-router-dom';
import { PageTitle } from '../../components/layout/app-shell';
import { Panel } from '../../components/ui/notice';
import { usePartTypes } from '../../features/stock/api/get-part-types';
import { useMachines } from '../../features/machines/api/get-machines';
import { LifeView } from '../../features/consumable-life/components/life-view';
import { ReferenceValues } from '../../features/consumable-life/components/reference-values';
import { useMe } from '../../features/auth/api/get-me';
import { can } from '../../../shared/permissions';
import { TORCH_CATEGORIES, PART_CATEGORY_LABELS } from '../../../shared/schemas/stock';

const select = 'block min-h-touch w-full rounded border border-steel-400 bg-white px-3';

export function Component() {
  const [params, setParams] = useSearchParams();
  const { data: me } = useMe();
  const parts = usePartTypes({});
  const machines = useMachines({});
  const torchParts = (parts.data ?? []).filter((p) => (TORCH_CATEGORIES as readonly string[]).includes(p.category) && p.lifeUnit);
  const partTypeId = params.get('part') ?? torchParts[0]?.id ?? '';
  const machineId = params.get('machine') ?? '';
  const set = (k: string, v: string) => {
    const next = new URLSearchParams(params);
    if (v) next.set(k, v);
    else next.delete(k);
    setParams(next, { replace: true });
  };
  return (
    <>
      <PageTitle title="Consumable life" subtitle="How long each torch part lasts in this shop, when to change it, and what it costs per hour of arc." />
      <Panel>
        <div className="grid gap-4 md:grid-cols-2">
          <label className="space-y-1 text-sm font-semibold">
            Part
            <select className={select} value={partTypeId} onChange={(e) => set('part', e.target.value)}>
              {torchParts.map((p) => (
                <option key={p.id} value={p.id}>
                  {p.partNumber} · {p.name} ({PART_CATEGORY_LABELS[p.category]})
                </option>
              ))}
            </select>
          </label>
          <label className="space-y-1 text-sm font-semibold">
            Machine
            <select className={select} value={machineId} onChange={(e) => set('machine', e.target.value)}>
              <option value="">All machines</option>
              {(machines.data ?? [])
                .filter((m) => m.depth === 0)
                .map((m) => (
                  <option key={m.id} value={m.id}>
                    {m.code} · {m.name}
                  </option>
                ))}
            </select>
          </label>
        </div>
      </Panel>
      {partTypeId ? <LifeView filters={{ partTypeId, machineId: machineId || undefined }} /> : null}
      <Panel title="Reference values">
        <ReferenceValues canEdit={!!me && can(me.role, 'org.settings.manage')} />
      </Panel>
    </>
  );
}
