import { Link } from 'react-router-dom';
import { Panel } from '../../../components/ui/notice';
import { can, type Role } from '../../../../shared/permissions';
import { paths } from '../../../config/paths';
import { useSafetyTasks } from '../api/get-safety-tasks';
import { useLockouts } from '../api/get-lockouts';

/** The safety log on each role's home: what is locked out, what is due, and the PPE check one tap away. */
export function SafetyHomePanel({ role }: { role: Role }) {
  const tasks = useSafetyTasks();
  const open = useLockouts({ state: 'open', page: 1, pageSize: 5 });
  const overdue = (tasks.data ?? []).filter((t) => t.status === 'overdue').length;
  const due = (tasks.data ?? []).length - overdue;
  const locked = open.data?.total ?? 0;
  return (
    <Panel
      title="Safety"
      actions={
        <Link className="inline-flex min-h-touch items-center font-semibold text-mandatory underline" to={paths.safety.getHref()}>
          Safety log
        </Link>
      }
    >
      <ul className="mb-3 space-y-1">
        <li className={locked ? 'font-semibold text-danger-ink' : 'text-safe-ink'}>
          {locked
            ? `${locked} machine${locked === 1 ? ' is' : 's are'} locked out: ${(open.data?.rows ?? []).map((r) => r.machineCode).join(', ')}`
            : 'No machine is locked out.'}
        </li>
        <li className={overdue ? 'font-semibold text-danger-ink' : due ? 'text-caution-ink' : 'text-safe-ink'}>
          {overdue || due ? `Safety work: ${overdue} overdue, ${due} due now.` : 'No safety work is due.'}
        </li>
      </ul>
      {can(role, 'safety.ppe.sign') ? (
        <Link className="flex min-h-touch items-center justify-center rounded bg-mandatory px-4 font-semibold text-white" to={paths.safetyPpe.getHref()}>
          Do my PPE check
        </Link>
      ) : null}
    </Panel>
  );
}
