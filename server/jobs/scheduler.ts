import cron, { type ScheduledTask } from 'node-cron';
import type { MikroORM } from '@mikro-orm/postgresql';
import { LOCKS, withAdvisoryLock } from './advisory-lock';
import { logger } from '../logger';
import { clock } from '../../shared/clock';

/** A pass over every shop (the schedule) or over one shop (an admin's "run now"). */
export type PassScope = { orgId?: string };
export type JobStep = { name: string; run: (orm: MikroORM, now: Date, scope: PassScope) => Promise<Record<string, number>> };

const steps: JobStep[] = [
  {
    name: 'expire-tokens',
    async run(orm, now, scope) {
      // Tokens belong to people, not shops: a one-shop pass leaves them to the scheduled one.
      if (scope.orgId) return { expiredTokensRemoved: 0 };
      const removed = await orm.em.getConnection().execute(`delete from user_token where used_at is null and expires_at < ?`, [now], 'run');
      return { expiredTokensRemoved: Number((removed as { affectedRows?: number }).affectedRows ?? 0) };
    },
  },
];

/** Start-up adds the feature steps (jobs/register.ts). */
export function registerJobStep(step: JobStep) {
  // Registering again (a new configuration) replaces the step in its place.
  const at = steps.findIndex((s) => s.name === step.name);
  if (at >= 0) steps[at] = step;
  else steps.push(step);
}

/** One scheduled pass over every step, under the advisory lock; `scope.orgId` limits it to one shop. */
export async function runScheduledPass(orm: MikroORM, now = clock.now(), scope: PassScope = {}) {
  return withAdvisoryLock(orm, LOCKS.scheduledPass, async () => {
    const results: Record<string, Record<string, number> | { error: string }> = {};
    for (const step of steps) {
      try {
        results[step.name] = await step.run(orm, now, scope);
      } catch (err) {
        logger.error({ err, step: step.name }, 'scheduled step failed');
        results[step.name] = { error: err instanceof Error ? err.message : String(err) };
      }
    }
    return results;
  });
}

export function startScheduler(orm: MikroORM, schedule: string): ScheduledTask {
  if (!cron.validate(schedule)) throw new Error(`JOB_SCHEDULE is not a valid cron expression: ${schedule}`);
  return cron.schedule(
    schedule,
    async () => {
      const result = await runScheduledPass(orm).catch((err) => logger.error({ err }, 'scheduled pass failed'));
      if (result === null) logger.info('scheduled pass skipped: another instance holds the lock');
    },
    { noOverlap: true, name: 'kerfbook-pass' },
  );
}
