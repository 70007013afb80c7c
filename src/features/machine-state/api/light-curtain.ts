import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { queryRoots } from '../../../lib/query-keys';
import type { LightCurtainCheckRow } from '../../../../shared/schemas/machine-state';
import type { z } from 'zod';
import type { lightCurtainCheckSchema } from '../../../../shared/schemas/machine-state';
import { machineStateKeys } from './keys';

const path = (code: string) => `/machines/${encodeURIComponent(code)}/light-curtain-checks`;

export const getLightCurtainChecksQueryOptions = (code: string) =>
  queryOptions({ queryKey: machineStateKeys.lightCurtain(code), queryFn: () => api<LightCurtainCheckRow[]>(path(code)) });
export const useLightCurtainChecks = (code: string) => useQuery(getLightCurtainChecksQueryOptions(code));

/** A failed check takes the brake out of service, so every state on screen is refreshed too. */
export function useRecordLightCurtainCheck(code: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: z.input<typeof lightCurtainCheckSchema>) => api<LightCurtainCheckRow>(path(code), { method: 'POST', body }),
    onSuccess: () => Promise.all([qc.invalidateQueries({ queryKey: machineStateKeys.all }), qc.invalidateQueries({ queryKey: queryRoots.machines })]),
  });
}
