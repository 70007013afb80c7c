import { useQueryClient } from '@tanstack/react-query';
import { queryRoots } from '../../../lib/query-keys';

/** Every safety query key starts with 'safety', so one invalidation refreshes the whole log after a signature. */
export const safetyKeys = {
  all: queryRoots.safety,
  machines: () => ['safety', 'machines'] as const,
  people: () => ['safety', 'people'] as const,
  settings: () => ['safety', 'settings'] as const,
  tasks: () => ['safety', 'tasks'] as const,
  procedures: () => ['safety', 'procedures', 'list'] as const,
  procedure: (id: string, version?: number) => ['safety', 'procedures', 'detail', id, version ?? 'current'] as const,
  lockouts: (f: object) => ['safety', 'lockouts', 'list', f] as const,
  lockout: (id: string) => ['safety', 'lockouts', 'detail', id] as const,
  absentRemovals: (lockoutId: string) => ['safety', 'lockouts', 'absent-removals', lockoutId] as const,
  testWindows: (lockoutId: string) => ['safety', 'lockouts', 'test-windows', lockoutId] as const,
  outsideParties: (lockoutId: string) => ['safety', 'lockouts', 'outside-parties', lockoutId] as const,
  authorization: (procedureId: string) => ['safety', 'procedures', 'authorization', procedureId] as const,
  locks: (f: object) => ['safety', 'locks', f] as const,
  events: (f: object) => ['safety', 'events', f] as const,
  ppe: (machineId?: string) => ['safety', 'ppe', 'requirements', machineId ?? 'all'] as const,
  inspections: () => ['safety', 'inspections'] as const,
  training: () => ['safety', 'training'] as const,
  fireWatches: () => ['safety', 'fire-watches'] as const,
  signOffs: (f: object) => ['safety', 'sign-offs', f] as const,
  chain: () => ['safety', 'chain'] as const,
  compliance: (days: number) => ['safety', 'compliance', days] as const,
  timeline: (weeks: number) => ['safety', 'timeline', weeks] as const,
  preUse: (code: string) => ['safety', 'pre-use', code.toUpperCase()] as const,
};

export function useInvalidateSafety() {
  const qc = useQueryClient();
  return () => qc.invalidateQueries({ queryKey: safetyKeys.all });
}

/**
 * Lockout state is also shown on the work-order page, cached under the work-orders feature's own
 * key prefix; refresh it too so that page never shows a released lockout as still needed.
 */
export function useInvalidateSafetyAndWorkOrders() {
  const qc = useQueryClient();
  return () => Promise.all([qc.invalidateQueries({ queryKey: safetyKeys.all }), qc.invalidateQueries({ queryKey: queryRoots.workOrders })]);
}
