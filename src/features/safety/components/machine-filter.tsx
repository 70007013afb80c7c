import { FilterSelect } from '../../../components/ui/data-table-filters';
import { useSafetyMachines } from '../api/get-safety-machines';

/** "Machine" above a safety list: every machine of the shop, or all of them. */
export function SafetyMachineFilter({ value, onChange }: { value: string; onChange: (machineId: string) => void }) {
  const machines = useSafetyMachines();
  return (
    <FilterSelect label="Machine" value={value} onChange={onChange}>
      <option value="">All machines</option>
      {(machines.data ?? []).map((m) => (
        <option key={m.id} value={m.id}>
          {m.code} · {m.name}
        </option>
      ))}
    </FilterSelect>
  );
}
