import { MACHINE_STATE_LABELS, type MachineState } from '../../../shared/schemas/machine-state';

/**
 * Colours after ISO 3864-1 safety colours: green = safe condition, red = stop/prohibition,
 * yellow (with black) = warning. Locked out is a warning that people are working inside.
 */
export const MACHINE_STATE_STYLES: Record<MachineState, string> = {
  'in-service': 'bg-[#237f52] text-white',
  'out-of-service': 'bg-[#9b2423] text-white',
  'locked-out': 'bg-[#f9a800] text-black',
};

export function MachineStateBadge({ state }: { state: MachineState }) {
  return (
    <span data-state={state} className={`inline-flex items-center rounded px-2 py-0.5 text-sm font-semibold ${MACHINE_STATE_STYLES[state]}`}>
      {MACHINE_STATE_LABELS[state]}
    </span>
  );
}
