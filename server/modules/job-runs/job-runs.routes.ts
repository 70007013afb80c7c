import type { EntityManager } from '@mikro-orm/postgresql';
import { route, type ApiRouter } from '../../http/route';
import { requestEm } from '../../db';
import { listJobRunsQuery, type JobRunRow, type RunNowResult } from '../../../shared/schemas/job-runs';
import { JobRun, type IJobRun } from './job-run.entity';
import { manualPass } from './job-run-context';
import { recordAudit } from '../audit/audit';

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

/** `runPass` runs the scheduled pass now (server/jobs); it resolves to null while another pass holds the lock. */
export function registerJobRunRoutes(r: ApiRouter, runPass: () => Promise<object | null>) {
  const em = () => requestEm() as EntityManager;
  route(r, 'get', '/job-runs', { access: 'jobs.run', query: listJobRunsQuery }, async (_req, res, { query: q }) => {
    const [items, total] = await em().findAndCount(JobRun, {}, { orderBy: { startedAt: 'desc' }, limit: q.pageSize, offset: (q.page - 1) * q.pageSize, populate: ['triggeredBy'] });
    res.json({ rows: items.map(toRow), total, page: q.page, pageSize: q.pageSize });
  });
  route(r, 'post', '/job-runs', { access: 'jobs.run' }, async (_req, res, { principal: who }) => {
    const result = await manualPass.run({ orgId: who.orgId, userId: who.userId }, runPass);
    if (result === null) {
      const body: RunNowResult = { ran: false, message: 'A pass is running right now; its results appear below in a moment.', run: null };
      return res.status(409).json({ error: 'conflict', ...body });
    }
    await em().transactional(async (tx) => {
      recordAudit(tx, who, 'jobs.run-now', { type: 'JobRun', id: null });
    });
    const [latest] = await em().find(JobRun, {}, { orderBy: { startedAt: 'desc' }, limit: 1, populate: ['triggeredBy'] });
    const body: RunNowResult = { ran: true, message: 'Pass finished.', run: latest ? toRow(latest) : null };
    res.json(body);
  });
}
