import { Badge } from '../../../components/ui/notice';
import { DUE_STATE_LABELS, type DueState } from '../../../../shared/schemas/plans';

/** ISO 3864-1: red = past due, yellow = due now / coming up; grey when on track. Words say it too. */
export function PlanDueBadge({ status }: { status: DueState }) {
  const tone = status === 'overdue' ? 'danger' : status === 'due' || status === 'due-soon' ? 'caution' : 'info';
  return <Badge tone={tone}>{DUE_STATE_LABELS[status]}</Badge>;
}
