import { MACHINE_STATE_STYLES } from '../../../components/ui/machine-state-badge';
import { useShopFormat } from '../../../lib/format';
import { MACHINE_STATE_LABELS, type MachineStatus } from '../../../../shared/schemas/machine-state';

// ISO 3864-1 safety colours: green for a safe condition, red for stop, yellow/black for warning (see the badge).
const HINT = {
  'in-service': 'The machine may be used.',
  'out-of-service': 'Do not run the machine until it is returned to service.',
  'locked-out': 'Energy is isolated: people may be working inside. Do not try to start it.',
} as const;

/** The machine's state across the top of the station page. */
export function StateBanner({ status }: { status: MachineStatus }) {
  const f = useShopFormat();
  return (
    <section aria-label="Machine state" data-state={status.state} className={`rounded-lg px-4 py-3 ${MACHINE_STATE_STYLES[status.state]}`}>
      <p className="text-2xl font-bold uppercase tracking-wide">{MACHINE_STATE_LABELS[status.state]}</p>
      <p className="font-medium">
        {status.reason ? `${status.reason}. ` : ''}
        {status.since ? `Since ${f.dateTime(status.since)}. ` : ''}
        {HINT[status.state]}
      </p>
    </section>
  );
}
