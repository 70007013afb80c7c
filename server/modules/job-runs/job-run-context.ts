import { AsyncLocalStorage } from 'node:async_hooks';

/** Set while an admin's "run now" pass runs, so the pass records who asked for it. */
export const manualPass = new AsyncLocalStorage<{ orgId: string; userId: string }>();
