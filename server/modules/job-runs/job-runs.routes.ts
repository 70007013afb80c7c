import type { EntityManager } from '@mikro-orm/postgresql';
import { route, type ApiRouter } from '../../http/route';
import { requestEm } from '../../db';
import { listJobRunsQuery, type RunNowResult } from '../../../shared/schemas/job-runs';
import { latestJobRun, listJobRuns } from './job-runs.service';
import { manualPass } from './job-run-context';
import { recordActivity } from '../activity-log/activity-log.service';

/** `runPass` runs the scheduled pass now over one shop (server/jobs); it resolves to null while another pass holds the lock. */
export function registerJobRunRoutes(r: ApiRouter, runPass: (orgId: string) => Promise<object | null>) {
  const em = () => requestEm() as EntityManager;
  route(r, 'get', '/job-runs', { access: 'jobs.run', query: listJobRunsQuery }, async (_req, res, { query: q }) => {
    res.json(await listJobRuns(em(), q));
  });
  route(r, 'post', '/job-runs', { access: 'jobs.run' }, async (_req, res, { principal: who }) => {
    const result = await manualPass.run({ orgId: who.orgId, userId: who.userId }, () => runPass(who.orgId));
    if (result === null) {
      const body: RunNowResult = { ran: false, message: 'A pass is running right now; its results appear below in a moment.', run: null };
      return res.status(409).json({ error: 'conflict', ...body });
    }
    await em().transactional(async (tx) => {
      recordActivity(tx, who, 'jobs.run-now', { type: 'JobRun', id: null });
    });
    const body: RunNowResult = { ran: true, message: 'Pass finished.', run: await latestJobRun(em()) };
    res.json(body);
  });
}
