import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { SafetySettingsView } from '../../../../shared/schemas/safety-records';
import { safetyKeys } from './keys';

export const getSafetySettingsQueryOptions = () =>
  queryOptions({ queryKey: safetyKeys.settings(), queryFn: () => api<SafetySettingsView>('/safety/settings') });
export const useSafetySettings = () => useQuery(getSafetySettingsQueryOptions());
