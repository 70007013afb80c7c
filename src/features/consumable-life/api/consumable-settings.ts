import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import { api } from '../../../lib/api-client';
import type { ReferenceValue, consumableSettingsSchema } from '../../../../shared/schemas/consumables';
import { queryRoots } from '../../../lib/query-keys';
import { consumableLifeKeys } from './keys';

export type ConsumableReference = Record<'electrodePitLimitMm' | 'cutToleranceMm' | 'changeTargetReliability', ReferenceValue>;

export const getConsumableSettings = () => api<ConsumableReference>('/consumable-settings');

export const getConsumableSettingsQueryOptions = () => queryOptions({ queryKey: consumableLifeKeys.settings(), queryFn: getConsumableSettings });

export const useConsumableSettings = () => useQuery(getConsumableSettingsQueryOptions());

export const updateConsumableSettings = (input: z.input<typeof consumableSettingsSchema>) =>
  api<ConsumableReference>('/consumable-settings', { method: 'PATCH', body: input });

/** Reference values feed the station page, the coupons and the life statistics. */
export function useUpdateConsumableSettings() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: updateConsumableSettings,
    onSuccess: () => Promise.all([qc.invalidateQueries({ queryKey: consumableLifeKeys.all }), qc.invalidateQueries({ queryKey: queryRoots.station })]),
  });
}
