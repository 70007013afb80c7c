/**
 * The scheduled pass's feature steps, registered once where the server starts (server/index.ts;
 * tests call it when they build the app), in the order they run: the due engine, the safety work,
 * then the daily copy of each shop's sign-off chain head to its safety officers, then the
 * compaction of the shops' change rows. The token clean-up step is built into the scheduler.
 */
import type { Config } from '../config';
import { runSafetyDue } from '../modules/safety/work';
import { chainCopyKey, mailChainCopies } from '../modules/safety/chain-copy';
import { maintenancePassStep } from './due-engine-pass';
import { registerJobStep } from './scheduler';
import { compactShopChanges } from '../modules/shop-changes/shop-revision';

export function registerJobSteps(config: Pick<Config, 'APP_URL' | 'SESSION_SECRET' | 'CHAIN_COPY_SECRET'>): void {
  registerJobStep(maintenancePassStep({ appUrl: config.APP_URL }));
  registerJobStep({ name: 'safety-due', run: runSafetyDue });
  const copyKey = chainCopyKey(config);
  registerJobStep({ name: 'safety-chain-copy', run: (orm, now, scope) => mailChainCopies(orm, copyKey, config.APP_URL, now, scope) });
  // Last, after the pass's own writes have added their change rows.
  registerJobStep({
    name: 'compact-shop-changes',
    run: async (orm, _now, scope) => ({ shopsCompacted: await compactShopChanges(orm.em.fork(), scope.orgId) }),
  });
}
