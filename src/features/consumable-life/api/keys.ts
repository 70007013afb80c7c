import { queryRoots } from '../../../lib/query-keys';

/** Consumable lives and the shop's consumable settings. */
export const consumableLifeKeys = {
  all: queryRoots.consumableLife,
  life: (f: object) => [...queryRoots.consumableLife, 'life', f] as const,
  settings: () => [...queryRoots.consumableLife, 'settings'] as const,
};
