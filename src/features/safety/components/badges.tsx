import { Badge } from '../../../components/ui/notice';
import { LOCKOUT_STATE_LABELS, type LockoutState } from '../../../../shared/schemas/safety-lockout';

/** ISO 3864-1 colours with the words beside them: red = locked (danger, do not operate), yellow = not yet verified, green = released. */
export function LockoutStateBadge({ state }: { state: LockoutState }) {
  const tone = state === 'released' ? 'safe' : state === 'verified' ? 'danger' : 'caution';
  return <Badge tone={tone}>{LOCKOUT_STATE_LABELS[state]}</Badge>;
}

export function DueBadge({ status }: { status: 'none' | 'not-due' | 'due-soon' | 'due' | 'overdue' | 'current' | 'retrain' }) {
  const map = {
    none: ['info', 'No procedure'],
    'not-due': ['safe', 'In date'],
    'due-soon': ['caution', 'Due soon'],
    due: ['caution', 'Due now'],
    overdue: ['danger', 'Overdue'],
    current: ['safe', 'Current'],
    retrain: ['danger', 'Retrain'],
  } as const;
  const [tone, text] = map[status];
  return <Badge tone={tone}>{text}</Badge>;
}
