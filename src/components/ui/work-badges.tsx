import { Badge } from './notice';
import { DUE_FILTER_LABELS, WORK_KIND_LABELS, WORK_STATE_LABELS, type DueFilter, type WorkKind, type WorkState } from '../../../shared/schemas/work-orders';

/** ISO 3864-1 meanings: red = past due, yellow = due now / coming up, green = done; the words say it too. */
export function DueBadge({ state }: { state: DueFilter | 'closed' }) {
  if (state === 'closed') return null;
  const tone = state === 'overdue' ? 'danger' : state === 'due' || state === 'due-soon' ? 'caution' : 'info';
  const label = state === 'due-soon' ? 'Coming up' : state === 'none' ? 'No due date' : DUE_FILTER_LABELS[state];
  return <Badge tone={tone}>{label}</Badge>;
}

export function StateBadge({ status }: { status: WorkState }) {
  const tone = status === 'done' ? 'safe' : 'info';
  return <Badge tone={tone}>{WORK_STATE_LABELS[status]}</Badge>;
}

export function KindBadge({ kind }: { kind: WorkKind }) {
  return <span className="text-xs font-semibold uppercase tracking-wide text-steel-600">{WORK_KIND_LABELS[kind]}</span>;
}

/** Blue: a mandatory action (ISO 3864-1). */
export function LockoutBadge() {
  return <Badge tone="mandatory">Lockout required</Badge>;
}

export function SafetyWorkBadge() {
  return <Badge tone="mandatory">Safety work</Badge>;
}
