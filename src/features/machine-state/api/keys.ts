import { queryRoots } from '../../../lib/query-keys';

/** Machine state keys: a stop or return refreshes every state shown. */
export const machineStateKeys = {
  all: queryRoots.machineState,
  status: (code: string) => [...queryRoots.machineState, 'status', code.toUpperCase()] as const,
  downtimes: (code: string) => [...queryRoots.machineState, 'downtimes', code.toUpperCase()] as const,
  reliability: (f: object) => [...queryRoots.machineState, 'reliability', f] as const,
  failureCodes: () => [...queryRoots.machineState, 'failure-codes'] as const,
  lightCurtain: (code: string) => [...queryRoots.machineState, 'light-curtain', code.toUpperCase()] as const,
};
