/**
 * The scheduled pass's feature steps, registered once where the server starts (server/index.ts;
 * tests call it when they build the app), in the order they run: the due engine, then the safety
 * work. The token clean-up step is built into the scheduler.
 */
import type { Config } from '../config';
import { runSafetyDue } from '../modules/safety/work';
import { maintenancePassStep } from './due-engine-pass';
import { registerJobStep } from './scheduler';

export function registerJobSteps(config: Pick<Config, 'APP_URL'>): void {
  registerJobStep(maintenancePassStep({ appUrl: config.APP_URL }));
  registerJobStep({ name: 'safety-due', run: runSafetyDue });
}
