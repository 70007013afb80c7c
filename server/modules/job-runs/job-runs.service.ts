import type { EntityManager } from '@mikro-orm/postgresql';
import type { JobRunRow } from '../../../shared/schemas/job-runs';
import { JobRun, type IJobRun } from './job-run.entity';

function toRow(j: IJobRun): JobRunRow {
  return {
    id: j.id,
    passId: j.passId,
    trigger: j.trigger,
    triggeredBy: j.triggeredBy?.isInitialized() ? j.triggeredBy.getEntity().name : null,
    startedAt: j.startedAt.toISOString(),
    finishedAt: j.finishedAt?.toISOString() ?? null,
    plansChecked: j.plansChecked,
    plansEvaluated: j.plansEvaluated,
    workOrdersRaised: j.workOrdersRaised,
    escalations: j.escalations,
    mailsQueued: j.mailsQueued,
    errors: j.errors,
  };
}

/** The scheduled passes, newest first. */
export async function listJobRuns(em: EntityManager, q: { page: number; pageSize: number }) {
  const [items, total] = await em.findAndCount(
    JobRun,
    {},
    { orderBy: { startedAt: 'desc' }, limit: q.pageSize, offset: (q.page - 1) * q.pageSize, populate: ['triggeredBy'] },
  );
  return { rows: items.map(toRow), total, page: q.page, pageSize: q.pageSize };
}

export async function latestJobRun(em: EntityManager): Promise<JobRunRow | null> {
  const [latest] = await em.find(JobRun, {}, { orderBy: { startedAt: 'desc' }, limit: 1, populate: ['triggeredBy'] });
  return latest ? toRow(latest) : null;
}
